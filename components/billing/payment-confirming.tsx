import { Notice } from '@/components/ui/notice';
import { formatDate } from '@/lib/dates';

/**
 * Beside an invoice's status while a card payment's outcome is unknown (the payment service's answer
 * was lost): the charge may have gone through, so the invoice is neither plainly outstanding nor paid
 * until the provider's webhook or the settling job records what happened.
 */
export function PaymentConfirmingBadge() {
  return (
    <span
      className="inline-block whitespace-nowrap rounded-full bg-fir-50 px-2 py-0.5 text-xs font-semibold text-fir-800 ring-1 ring-fir-200"
      data-state="payment-confirming"
    >
      Payment being confirmed
    </span>
  );
}

/** The explanation of {@link PaymentConfirmingBadge}, worded for the member who paid or for the treasurer. */
export function PaymentConfirmingNotice({
  startedAt,
  timezone,
  audience,
}: {
  startedAt: string;
  timezone: string;
  audience: 'member' | 'treasurer';
}) {
  const when = formatDate(startedAt, timezone);
  return audience === 'member' ? (
    <Notice tone="warn" title="Payment being confirmed">
      Your card payment from {when} may have gone through; we are waiting for the payment service to confirm it, and
      this page will show it as paid once it does. You will not be charged twice: trying again uses the same payment.
    </Notice>
  ) : (
    <Notice tone="warn" title="Payment being confirmed">
      A card payment started {when} did not get a clear answer from the payment service. It is recorded here by itself
      when the service confirms it (or after the automatic check), so don’t record it by hand or void the invoice until
      then.
    </Notice>
  );
}
