import Link from "next/link";

export const metadata = { title: "No access" };

export default function NoAccessPage() {
  return (
    <main className="mx-auto max-w-lg p-8">
      <h1 className="text-2xl font-semibold">Your role cannot open this page</h1>
      <p className="mt-2 text-graphite-600">Ask the shop owner if you need it.</p>
      <Link href="/jobs" className="btn-secondary mt-6">
        Back to jobs
      </Link>
    </main>
  );
}
