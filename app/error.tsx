'use client';

export default function ErrorPage({ reset }: { error: Error; reset: () => void }) {
  return (
    <main className="mx-auto max-w-lg px-4 py-16 text-center">
      <h1>Something went wrong</h1>
      <p className="mt-2 text-stone-700">The page could not be shown. Nothing you entered was lost on our side; try again.</p>
      <button type="button" onClick={reset} className="mt-4 min-h-11 rounded-lg bg-fir-700 px-4 py-2 font-semibold text-white">Try again</button>
    </main>
  );
}
