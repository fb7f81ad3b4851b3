'use client';

export default function GlobalError({ reset }: { error: Error; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: 'system-ui', padding: 40 }}>
        <h1>Something went wrong</h1>
        <p>The error has been logged. Try again, or reload the page.</p>
        <button onClick={reset}>Try again</button>
      </body>
    </html>
  );
}
