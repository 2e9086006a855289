'use client';

import { useRouter } from 'next/navigation';
import { useEffect } from 'react';

/**
 * While `active` (an e-mail still queued), re-renders the server page every `everyMs` for at most
 * ten minutes, so a status the worker changes shows up without a reload.
 */
export function useRefreshWhile(active: boolean, everyMs = 2000): void {
  const router = useRouter();
  useEffect(() => {
    if (!active) return;
    const until = Date.now() + 600_000;
    const timer = setInterval(() => (Date.now() > until ? clearInterval(timer) : router.refresh()), everyMs);
    return () => clearInterval(timer);
  }, [active, everyMs, router]);
}
