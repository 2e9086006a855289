import type { ReactNode } from 'react';

/** One labelled figure of a batch record (inside a `<dl>`), with an optional line under it. */
export function Figure({ label, value, sub }: { label: string; value: ReactNode; sub?: ReactNode }) {
  return (
    <div className="rounded-lg border border-stone-200 bg-stone-50 p-3">
      <dt className="text-xs uppercase tracking-wide text-stone-600">{label}</dt>
      <dd className="text-lg font-bold text-fir-900">{value}</dd>
      {sub ? <dd className="text-xs text-stone-700">{sub}</dd> : null}
    </div>
  );
}
