export default function Loading() {
  return (
    <div aria-busy="true" aria-live="polite" className="animate-pulse space-y-3">
      <div className="h-7 w-64 rounded bg-rule" />
      <div className="h-4 w-96 rounded bg-rule" />
      <div className="h-64 rounded bg-rule/60" />
      <span className="sr-only">Loading…</span>
    </div>
  );
}
