import { EmptyState } from '@/components/ui/notice';

/** What a member sees on a treasurer's page: a plain explanation and where to go instead. */
export function BillingForbidden({ coop }: { coop: string }) {
  return (
    <EmptyState title="Billing is for the co-op’s treasurer and admins">
      Your own invoices are under <a href={`/c/${coop}/invoices`}>My invoices</a>.
    </EmptyState>
  );
}
