'use client';

import { useRouter } from 'next/navigation';
import { startTransition, useEffect, useRef, useState } from 'react';

/** How often the page asks whether the database is back while it is away (ms). */
const RECHECK_MS = 5_000;

type Health = 'checking' | 'db-down' | 'ok';

async function checkHealth(): Promise<Health> {
  try {
    const res = await fetch('/api/health', { cache: 'no-store' });
    if (res.ok) return 'ok';
    const body = (await res.json().catch(() => null)) as { db?: string } | null;
    return body?.db === 'down' ? 'db-down' : 'ok';
  } catch {
    return 'ok'; // the server itself is unreachable: nothing more specific to say than the general error
  }
}

/**
 * What an error boundary shows. A page error caused by an unreachable database (the health check
 * says so) gets its own state, which checks again every few seconds and reloads the page once the
 * database answers; any other error offers a retry and shows the error's reference (its digest,
 * the same one the server logged) so a person can quote it.
 */
export function ErrorState({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  const router = useRouter();
  const [health, setHealth] = useState<Health>('checking');
  const wasDown = useRef(false);

  useEffect(() => {
    let live = true;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const check = async () => {
      const h = await checkHealth();
      if (!live) return;
      setHealth(h);
      if (h === 'db-down') {
        wasDown.current = true;
        timer = setTimeout(check, RECHECK_MS);
      } else if (wasDown.current) {
        wasDown.current = false;
        startTransition(() => {
          router.refresh();
          reset();
        });
      }
    };
    void check();
    return () => {
      live = false;
      clearTimeout(timer);
    };
  }, [router, reset]);

  const retry = () =>
    startTransition(() => {
      router.refresh();
      reset();
    });

  if (health === 'checking') {
    return (
      <main className="mx-auto max-w-lg px-4 py-16 text-center" data-state="checking">
        <p role="status" className="text-stone-700">
          This page could not be shown; checking why…
        </p>
      </main>
    );
  }
  if (health === 'db-down') {
    return (
      <main className="mx-auto max-w-lg px-4 py-16 text-center" data-state="database-unavailable">
        <h1>We can’t reach the database</h1>
        <p className="mt-2 text-stone-700">
          Tallyvat is running, but its database is not answering right now, so this page can’t be shown. Nothing you
          saved before is lost; a change you were making when this appeared was not saved.
        </p>
        <p className="mt-2 text-sm text-stone-600" role="status">
          We check again every few seconds and reload this page as soon as the database is back.
        </p>
        <button
          type="button"
          onClick={retry}
          className="mt-4 min-h-11 rounded-lg bg-fir-700 px-4 py-2 font-semibold text-white"
        >
          Try now
        </button>
        {error.digest ? (
          <p className="mt-6 text-xs text-stone-500">
            Reference: <code>{error.digest}</code>
          </p>
        ) : null}
      </main>
    );
  }
  return (
    <main className="mx-auto max-w-lg px-4 py-16 text-center" data-state="error">
      <h1>Something went wrong</h1>
      <p className="mt-2 text-stone-700">
        The page could not be shown. Nothing you entered was lost on our side; try again.
      </p>
      <button
        type="button"
        onClick={retry}
        className="mt-4 min-h-11 rounded-lg bg-fir-700 px-4 py-2 font-semibold text-white"
      >
        Try again
      </button>
      {error.digest ? (
        <p className="mt-6 text-sm text-stone-600">
          If it keeps happening, tell your co-op’s admin this reference:{' '}
          <code className="select-all">{error.digest}</code>
        </p>
      ) : null}
    </main>
  );
}
