import { STATUS_LABELS, statusTone, VERDICT_LABELS, verdictTone } from './format';

export function StatusBadge({ status }: { status: string }) {
  return (
    <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-semibold ${statusTone(status)}`}>
      {STATUS_LABELS[status] ?? status}
    </span>
  );
}

export function VerdictBadge({ verdict, prefix }: { verdict: string; prefix?: string }) {
  return (
    <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-semibold ${verdictTone(verdict)}`}>
      {prefix ? `${prefix}: ` : ''}
      {VERDICT_LABELS[verdict] ?? verdict}
    </span>
  );
}

/** A batch's quality in the one wording of lib/quality ("Meets ASTM D6751", "Fails: …", "Screened — n of m …"). */
export function QualityBadge({ text, kind }: { text: string; kind: 'meets' | 'fails' | 'screened' }) {
  return (
    <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-semibold ${verdictTone(kind)}`}>
      {text}
    </span>
  );
}
