'use client';

import { useRouter } from 'next/navigation';
import { useId } from 'react';
import { SelectField } from '@/components/ui/field';
import { SubmitButton } from '@/components/forms/submit-button';

/**
 * Sorting for a table shown as cards (below 640 px, where the column headers are hidden): a
 * column and a direction, applied by the button (choosing alone never reloads the page). It
 * writes the same `?sort=&dir=` the headers do, so both views share one sorting state.
 */
export function PhoneSort({
  caption,
  options,
  sort,
  dir,
  hrefFor,
}: {
  caption: string;
  options: { id: string; label: string }[];
  sort: string | null;
  dir: 'asc' | 'desc';
  hrefFor: (sort: string, dir: 'asc' | 'desc') => string;
}) {
  const router = useRouter();
  const id = useId();
  function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const col = String(f.get('sort') ?? '');
    if (!options.some((o) => o.id === col)) return;
    router.push(hrefFor(col, f.get('dir') === 'desc' ? 'desc' : 'asc'));
  }
  return (
    // Keyed by the sort in force, so the choices show it again after the page reloads.
    <form
      key={`${sort}-${dir}`}
      onSubmit={onSubmit}
      aria-label={`Sort ${caption}`}
      className="flex flex-wrap items-end gap-2 border-b border-stone-200 bg-stone-50 px-3 py-2 sm:hidden"
    >
      <div className="min-w-0 flex-1">
        <SelectField
          id={`${id}-sort`}
          label="Sort by"
          name="sort"
          defaultValue={sort && options.some((o) => o.id === sort) ? sort : options[0]!.id}
        >
          {options.map((o) => (
            <option key={o.id} value={o.id}>
              {o.label}
            </option>
          ))}
        </SelectField>
      </div>
      <div className="min-w-0 flex-1">
        <SelectField id={`${id}-dir`} label="Order" name="dir" defaultValue={dir}>
          <option value="asc">Ascending (A–Z, 0–9)</option>
          <option value="desc">Descending (Z–A, 9–0)</option>
        </SelectField>
      </div>
      <SubmitButton variant="secondary">Sort</SubmitButton>
    </form>
  );
}
