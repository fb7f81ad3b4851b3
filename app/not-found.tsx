import Link from 'next/link';

export default function NotFound() {
  return (
    <main className="mx-auto max-w-lg p-10">
      <h1 className="text-lg font-semibold">Not found</h1>
      <p className="mt-2 text-muted">This page does not exist, or it belongs to a workspace you are not a member of.</p>
      <Link className="btn mt-4" href="/">Go to your workspace</Link>
    </main>
  );
}
