'use client';

import { useEffect, useRef, useState, type ReactNode } from 'react';
import { afterLoad } from '@/components/ui/after-load';

/**
 * Renders its children once the page has loaded and the box comes near the screen (200 px
 * ahead), so a chart's code and drawing never hold up the first screen and wait until someone
 * scrolls to it; the box keeps its size meanwhile (no layout shift).
 */
export function WhenVisible({ children, className = 'h-full w-full' }: { children: ReactNode; className?: string }) {
  const ref = useRef<HTMLDivElement>(null);
  const [seen, setSeen] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el || seen) return;
    let io: IntersectionObserver | null = null;
    const cancel = afterLoad(() => {
      io = new IntersectionObserver(
        (entries) => {
          if (entries.some((e) => e.isIntersecting)) setSeen(true);
        },
        { rootMargin: '200px' },
      );
      io.observe(el);
    });
    return () => {
      cancel();
      io?.disconnect();
    };
  }, [seen]);
  return (
    <div ref={ref} className={className}>
      {seen ? children : null}
    </div>
  );
}
