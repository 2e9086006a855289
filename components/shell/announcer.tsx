'use client';

import { usePathname } from 'next/navigation';
import { createContext, useCallback, useContext, useEffect, useRef, useState, type ReactNode } from 'react';

export type Announcement = { tone: 'ok' | 'danger'; text: string };
type Announce = (a: Announcement | null) => void;

const AnnounceContext = createContext<Announce>(() => {});

/**
 * The one place the result of an action is said: a message pinned to the bottom of the screen
 * (where a thumb and eyes are on a phone), in a live region, and keyboard focus moved onto it —
 * so after Cancel, Suspend or Release nobody is left at the top of the page wondering. It stays
 * until dismissed, replaced or the person goes to another page.
 */
export function Announcer({ children }: { children: ReactNode }) {
  const [said, setMessage] = useState<(Announcement & { n: number; path: string }) | null>(null);
  const box = useRef<HTMLDivElement>(null);
  const path = usePathname();
  const count = useRef(0);
  const announce = useCallback<Announce>((a) => setMessage(a ? { ...a, n: ++count.current, path } : null), [path]);
  // Said on the page it belongs to: another page starts without it.
  const message = said && said.path === path ? said : null;
  useEffect(() => {
    if (message) box.current?.focus();
  }, [message]);
  return (
    <AnnounceContext.Provider value={announce}>
      {children}
      <div
        role="status"
        aria-live="polite"
        className="pointer-events-none fixed inset-x-0 bottom-0 z-40 flex justify-center p-3 sm:justify-end"
      >
        {message ? (
          <div
            ref={box}
            tabIndex={-1}
            data-testid="announcement"
            className={`pointer-events-auto flex w-full max-w-md items-start gap-3 rounded-xl border p-3 text-sm shadow-lg outline-offset-2 ${
              message.tone === 'ok'
                ? 'border-ok-600/30 bg-ok-50 text-ok-700'
                : 'border-danger-600/30 bg-danger-50 text-danger-700'
            }`}
          >
            <p className="flex-1 font-medium">{message.text}</p>
            <button
              type="button"
              onClick={() => setMessage(null)}
              className="min-h-10 shrink-0 rounded-md px-2 font-semibold underline-offset-2 hover:underline"
            >
              Dismiss
            </button>
          </div>
        ) : null}
      </div>
    </AnnounceContext.Provider>
  );
}

/** Says the result of an action through the shell's Announcer (see there). */
export function useAnnounce(): Announce {
  return useContext(AnnounceContext);
}
