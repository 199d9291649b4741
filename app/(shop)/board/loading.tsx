export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="p-8 text-graphite-500">
      Loading…
    </div>
  );
}
