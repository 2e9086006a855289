import Link from 'next/link';

export default function NotFound() {
  return (
    <main className="mx-auto max-w-lg px-4 py-16 text-center">
      <h1>Not found</h1>
      <p className="mt-2 text-stone-700">
        This page does not exist, or you are not a member of the co-op it belongs to.
      </p>
      <p className="mt-4">
        <Link href="/coops">Go to my co-ops</Link>
      </p>
    </main>
  );
}
