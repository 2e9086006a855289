import type { ReactNode } from 'react';

type Tone = 'info' | 'ok' | 'warn' | 'danger';
const tones: Record<Tone, string> = {
  info: 'border-fir-200 bg-fir-50 text-fir-900',
  ok: 'border-ok-600/30 bg-ok-50 text-ok-700',
  warn: 'border-warn-600/30 bg-warn-50 text-warn-700',
  danger: 'border-danger-600/30 bg-danger-50 text-danger-700',
};

/** A boxed message; `role="alert"` for warnings and errors so screen readers announce them. */
export function Notice({ tone = 'info', title, children }: { tone?: Tone; title?: string; children?: ReactNode }) {
  return (
    <div
      role={tone === 'danger' || tone === 'warn' ? 'alert' : 'status'}
      className={`rounded-lg border p-3 text-sm ${tones[tone]}`}
    >
      {title ? <p className="font-semibold">{title}</p> : null}
      {children}
    </div>
  );
}

/** A designed empty state: what is missing and what to do about it. */
export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-xl border border-dashed border-stone-300 bg-white p-6 text-center">
      <p className="font-semibold text-stone-800">{title}</p>
      {children ? <div className="mt-1 text-sm text-stone-600">{children}</div> : null}
    </div>
  );
}

/** A white panel; `id` makes it a link target, kept clear of the pinned step navigator. */
export function Card({
  title,
  children,
  className = '',
  id,
}: {
  title?: string;
  children: ReactNode;
  className?: string;
  id?: string;
}) {
  return (
    <section id={id} className={`scroll-mt-28 rounded-xl border border-stone-200 bg-white p-4 shadow-sm ${className}`}>
      {title ? <h2 className="mb-3">{title}</h2> : null}
      {children}
    </section>
  );
}
