import { EMAIL_STATUS_LABEL, INVOICE_STATUS_LABEL } from '@/lib/billing/status';

const INVOICE_TONE: Record<string, string> = {
  draft: 'bg-stone-100 text-stone-700 ring-stone-300',
  issued: 'bg-amber-50 text-amber-800 ring-amber-300',
  'partly-paid': 'bg-warn-50 text-warn-700 ring-warn-600/40',
  paid: 'bg-ok-50 text-ok-700 ring-ok-600/40',
  void: 'bg-stone-100 text-stone-700 ring-stone-300',
};

/** An invoice's status as a small labelled pill (text, not colour alone, carries the meaning). */
export function InvoiceStatusBadge({
  status,
  kind = 'invoice',
  overdue = false,
}: {
  status: string;
  kind?: 'invoice' | 'credit-note';
  overdue?: boolean;
}) {
  if (kind === 'credit-note')
    return (
      <span className="inline-block rounded-full bg-fir-50 px-2 py-0.5 text-xs font-semibold text-fir-800 ring-1 ring-fir-200">
        Credit note
      </span>
    );
  return (
    <span
      className={`inline-block whitespace-nowrap rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ${INVOICE_TONE[status] ?? INVOICE_TONE.draft}`}
    >
      {INVOICE_STATUS_LABEL[status] ?? status}
      {overdue ? ' · overdue' : ''}
    </span>
  );
}

export function EmailStatusText({ status }: { status: string }) {
  const tone =
    status === 'failed' ? 'text-danger-700 font-semibold' : status === 'sent' ? 'text-ok-700' : 'text-stone-700';
  return <span className={tone}>{EMAIL_STATUS_LABEL[status] ?? status}</span>;
}

export function PeriodStatusBadge({ closed }: { closed: boolean }) {
  return closed ? (
    <span className="inline-block rounded-full bg-stone-800 px-2 py-0.5 text-xs font-semibold text-white">Closed</span>
  ) : (
    <span className="inline-block rounded-full bg-fir-50 px-2 py-0.5 text-xs font-semibold text-fir-800 ring-1 ring-fir-200">
      Open
    </span>
  );
}
