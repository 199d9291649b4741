"use client";

export default function ErrorPage({ reset }: { error: Error; reset: () => void }) {
  return (
    <main className="mx-auto max-w-lg p-8">
      <h1 className="text-2xl font-semibold">This page could not be shown</h1>
      <p className="mt-2 text-graphite-600">
        Nothing you saved has been lost. Try again; if it keeps happening, tell the shop owner the
        time it happened.
      </p>
      <button type="button" onClick={reset} className="btn-primary mt-6">
        Try again
      </button>
    </main>
  );
}
