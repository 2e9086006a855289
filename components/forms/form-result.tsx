'use client';

import { useEffect, useRef } from 'react';
import { Notice } from '@/components/ui/notice';

/**
 * A form's answer, placed beside its submit button (where the person is looking) and given
 * keyboard focus and scrolled into view when it changes, so it is seen on a phone and said by
 * screen readers (the Notice is a live region).
 */
export function FormResult({
  message,
  className = '',
}: {
  message: { tone: 'ok' | 'danger'; text: string } | null;
  className?: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (!message || !box.current) return;
    box.current.focus({ preventScroll: true });
    box.current.scrollIntoView({ block: 'nearest', behavior: 'smooth' });
  }, [message]);
  if (!message) return null;
  return (
    <div ref={box} tabIndex={-1} className={`outline-offset-2 ${className}`}>
      <Notice tone={message.tone}>{message.text}</Notice>
    </div>
  );
}
