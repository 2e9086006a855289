'use client';

import { useEffect, useId, useRef } from 'react';

/**
 * Forms on the batch page with typed values not yet saved. Moving a batch on (or releasing it)
 * saves them first, so nothing typed is lost; a form that can't be saved stops the move.
 */
type Saver = () => Promise<boolean>;
const dirty = new Map<string, Saver>();

/** Registers a form's unsaved values and how to save them. */
export function markDirty(id: string, save: Saver): void {
  dirty.set(id, save);
}

/** The form's values are saved (or discarded). */
export function markClean(id: string): void {
  dirty.delete(id);
}

/** True while some form holds unsaved values. */
export function hasUnsaved(): boolean {
  return dirty.size > 0;
}

/**
 * Saves every form with unsaved values, in turn.
 * @returns true when all saved (or none was dirty); false when one failed (its errors show beside its fields)
 */
export async function saveAllUnsaved(): Promise<boolean> {
  for (const [id, save] of [...dirty]) {
    if (!(await save())) return false;
    dirty.delete(id);
  }
  return true;
}

/**
 * Registers a form while it holds typed values (`isDirty`), so that moving the batch on saves
 * them first through `save(form)`; leaving the page while any form is dirty asks first.
 * @returns the id to pass to markClean once the form is saved, and the ref for the form element
 */
export function useUnsavedForm(isDirty: boolean, save: (form: HTMLFormElement) => Promise<boolean>) {
  const id = useId();
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (!isDirty) {
      markClean(id);
      return;
    }
    markDirty(id, () => (formRef.current ? save(formRef.current) : Promise.resolve(true)));
    const warn = (e: BeforeUnloadEvent) => {
      if (hasUnsaved()) e.preventDefault();
    };
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  });
  useEffect(() => () => markClean(id), [id]);
  return { id, formRef };
}
