'use client';

import { useState } from 'react';
import { STATUS_LABELS, STEP_ORDER } from './format';

/** The card each step's record is in (the page gives its cards these ids). */
export const STEP_ANCHORS: Record<string, string> = {
  planned: 'step-plan',
  reacting: 'step-reaction',
  settling: 'step-settling',
  draining: 'step-settling',
  washing: 'step-washing',
  drying: 'step-drying',
  testing: 'step-testing',
  released: 'step-result',
  rejected: 'step-result',
};

/**
 * The batch's steps, pinned to the top of the screen while the long record scrolls, each a link
 * to its card; "Next" jumps to the actions. On a phone one line says "Step 3 of 8 ·
 * Settling" and "Steps" opens the list (no sideways-scrolling strip). The current step carries
 * aria-current="step".
 */
export function StepNav({ status, hasActions }: { status: string; hasActions: boolean }) {
  const [open, setOpen] = useState(false);
  const steps = [...STEP_ORDER, status === 'rejected' ? 'rejected' : 'released'];
  const current = STEP_ORDER.indexOf(status as (typeof STEP_ORDER)[number]);
  const done = status === 'released' ? STEP_ORDER.length : current;
  const at = steps.indexOf(status);
  const link = 'block rounded-full border px-2.5 py-1.5 text-xs font-semibold no-underline';
  return (
    <nav
      aria-label="Batch steps"
      className="sticky top-0 z-20 -mx-4 border-b border-stone-200 bg-white/95 px-4 py-2 shadow-sm backdrop-blur"
    >
      <div className="flex items-center justify-between gap-2 sm:hidden">
        <span className="min-w-0 text-sm font-semibold text-fir-900">
          Step {at + 1} of {steps.length} · {STATUS_LABELS[status] ?? status}
        </span>
        <span className="flex shrink-0 gap-2">
          {hasActions ? (
            <a
              href="#step-next"
              aria-label="Next step actions"
              className="inline-flex min-h-10 items-center whitespace-nowrap rounded-md bg-fir-700 px-3 text-sm font-semibold text-white no-underline"
            >
              Next
            </a>
          ) : null}
          <button
            type="button"
            aria-expanded={open}
            aria-controls="batch-steps"
            onClick={() => setOpen((o) => !o)}
            className="inline-flex min-h-10 items-center whitespace-nowrap rounded-md border border-stone-300 px-3 text-sm font-semibold text-stone-900"
          >
            Steps{' '}
            <span aria-hidden="true" className="ml-1">
              {open ? '▴' : '▾'}
            </span>
          </button>
        </span>
      </div>
      <ol
        id="batch-steps"
        className={`gap-1 text-xs max-sm:mt-2 max-sm:grid max-sm:grid-cols-2 sm:flex sm:flex-wrap sm:items-center ${open ? '' : 'max-sm:hidden'}`}
      >
        {steps.map((s, i) => {
          const state =
            s === status ? 'current' : i < done || (status === 'released' && s === 'released') ? 'done' : 'todo';
          return (
            <li key={s} aria-current={state === 'current' ? 'step' : undefined}>
              <a
                href={`#${STEP_ANCHORS[s]}`}
                onClick={() => setOpen(false)}
                className={`${link} ${state === 'current' ? (s === 'rejected' ? 'border-danger-600 bg-danger-600 text-white' : 'border-fir-700 bg-fir-700 text-white') : state === 'done' ? 'border-fir-200 bg-fir-50 text-fir-900' : 'border-stone-300 bg-white text-stone-700'}`}
              >
                {i + 1}. {STATUS_LABELS[s]}
                {state === 'done' ? <span className="sr-only"> (done)</span> : null}
              </a>
            </li>
          );
        })}
        {hasActions ? (
          <li className="max-sm:hidden sm:ml-auto">
            <a href="#step-next" className={`${link} border-fir-700 text-fir-800`}>
              What’s next ↓
            </a>
          </li>
        ) : null}
      </ol>
    </nav>
  );
}
