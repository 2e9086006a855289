'use client';

import { useEffect, useId, useRef, useState } from 'react';

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
 * A form on the batch page whose typed values must not be lost: once something is typed it is
 * registered, so that moving the batch on (or releasing it) saves it first through `save(form)`,
 * and leaving the page while any form is dirty asks first. `save` sends the values and says
 * whether they were stored; the form is clean again once it has.
 * @returns the form's ref, whether it holds unsaved values, and its change and submit handlers
 */
export function useUnsavedForm(save: (form: HTMLFormElement) => Promise<boolean>) {
  const id = useId();
  const formRef = useRef<HTMLFormElement>(null);
  const [dirty, setDirty] = useState(false);
  const saveForm = async (form: HTMLFormElement) => {
    const ok = await save(form);
    if (ok) {
      markClean(id);
      setDirty(false);
    }
    return ok;
  };
  useEffect(() => {
    if (!dirty) {
      markClean(id);
      return;
    }
    markDirty(id, () => (formRef.current ? saveForm(formRef.current) : Promise.resolve(true)));
    const warn = (e: BeforeUnloadEvent) => {
      if (hasUnsaved()) e.preventDefault();
    };
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  });
  useEffect(() => () => markClean(id), [id]);
  return {
    formRef,
    dirty,
    onChange: () => setDirty(true),
    onSubmit: async (e: React.FormEvent<HTMLFormElement>) => {
      e.preventDefault();
      await saveForm(e.currentTarget);
    },
  };
}
