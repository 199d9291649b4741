import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-lg p-8">
      <h1 className="text-2xl font-semibold">Not here</h1>
      <p className="mt-2 text-graphite-600">
        There is nothing at this address, or it is not yours to see.
      </p>
      <Link href="/jobs" className="btn-secondary mt-6">
        Back to jobs
      </Link>
    </main>
  );
}
