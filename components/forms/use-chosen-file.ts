'use client';

import { useEffect, useRef, type ChangeEvent } from 'react';

/**
 * A file input whose choice reaches the screen even when it was made before the page came alive
 * (a slow phone shows the input before its script runs, and that change event is lost): on mount
 * the input's current file is taken as chosen. Spread the result onto the `<input type="file">`.
 */
export function useChosenFile(onChoose: (file: File | undefined) => void) {
  const ref = useRef<HTMLInputElement>(null);
  const latest = useRef(onChoose);
  useEffect(() => {
    latest.current = onChoose;
  });
  useEffect(() => {
    const early = ref.current?.files?.[0];
    if (early) latest.current(early);
  }, []);
  return { ref, onChange: (e: ChangeEvent<HTMLInputElement>) => onChoose(e.currentTarget.files?.[0]) };
}
