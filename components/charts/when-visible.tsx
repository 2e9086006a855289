'use client';

import { useEffect, useRef, useState, type ReactNode } from 'react';

/**
 * Renders its children once the box comes near the screen (200 px ahead), so a chart's code and
 * drawing wait until someone scrolls to it; the box keeps its size meanwhile (no layout shift).
 */
export function WhenVisible({ children, className = 'h-full w-full' }: { children: ReactNode; className?: string }) {
  const ref = useRef<HTMLDivElement>(null);
  const [seen, setSeen] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el || seen) return;
    const io = new IntersectionObserver((entries) => {
      if (entries.some((e) => e.isIntersecting)) setSeen(true);
    }, { rootMargin: '200px' });
    io.observe(el);
    return () => io.disconnect();
  }, [seen]);
  return <div ref={ref} className={className}>{seen ? children : null}</div>;
}
