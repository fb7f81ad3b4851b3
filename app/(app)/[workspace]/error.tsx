'use client';

export default function SectionError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div role="alert" className="card p-6">
      <h1 className="text-base font-semibold">This page could not be shown</h1>
      <p className="mt-1 text-sm text-muted">Something went wrong on our side; it has been logged. Try again.</p>
      <button className="btn mt-3" onClick={reset}>Try again</button>
    </div>
  );
}
