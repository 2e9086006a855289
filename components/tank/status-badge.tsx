/** A status as a word in a tinted pill: the word carries the meaning, the tint only helps. */
const tones: Record<string, string> = {
  open: 'bg-fir-100 text-fir-900',
  drawn: 'bg-stone-200 text-stone-800',
  cancelled: 'bg-stone-100 text-stone-700',
  expired: 'bg-warn-50 text-warn-700',
  recorded: 'bg-fir-100 text-fir-900',
  reversed: 'bg-warn-50 text-warn-700',
  reversal: 'bg-danger-50 text-danger-700',
  'in-force': 'bg-ok-50 text-ok-700',
  scheduled: 'bg-amber-50 text-amber-800',
  past: 'bg-stone-100 text-stone-700',
};

export function StatusBadge({ status, label }: { status: string; label?: string }) {
  return (
    <span
      className={`inline-block rounded-full px-2 py-0.5 text-xs font-semibold ${tones[status] ?? 'bg-stone-100 text-stone-800'}`}
    >
      {label ?? status}
    </span>
  );
}
