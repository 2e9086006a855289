'use client';

/** Runs `fn` once the page has loaded and the browser is idle (work that must not compete with first paint); returns a cancel. */
export function afterLoad(fn: () => void): () => void {
  let cancelled = false;
  const hasIdle = typeof window.requestIdleCallback === 'function';
  let idle = 0;
  const run = () => {
    if (cancelled) return;
    idle = hasIdle ? window.requestIdleCallback(fn, { timeout: 1500 }) : (setTimeout(fn, 200) as unknown as number);
  };
  if (document.readyState === 'complete') run();
  else window.addEventListener('load', run, { once: true });
  return () => {
    cancelled = true;
    window.removeEventListener('load', run);
    if (hasIdle) window.cancelIdleCallback(idle);
    else clearTimeout(idle);
  };
}
