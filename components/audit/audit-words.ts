import type { AuditEventDto } from '@/lib/audit/types';

/** What each recorded action did, said after the person's name. */
const DID: Record<string, string> = {
  'coop.create': 'created the co-op',
  'coop.settings': 'changed the co-op’s settings',
  'membership.create': 'added a member',
  'membership.remove': 'removed a member',
  'membership.update': 'changed a member’s role and access',
  'membership.role-change': 'changed a member’s role',
  'membership.suspend': 'suspended a member',
  'membership.reinstate': 'reinstated a member',
  'invitation.create': 'sent an invitation',
  'invitation.resend': 'sent an invitation again',
  'invitation.renew': 'renewed an invitation',
  'invitation.revoke': 'withdrew an invitation',
  'invitation.accept': 'accepted an invitation',
  'batch.create': 'planned a batch',
  'batch.update': 'updated a batch record',
  'batch.advance': 'moved a batch to its next step',
  'batch.temperature': 'logged a reaction temperature',
  'batch.release': 'released a batch into a tank',
  'batch.reject': 'rejected a batch',
  'batch.file': 'attached a file to a batch',
  'oil-lot.create': 'recorded collected oil',
  'chemical-lot.create': 'recorded a chemical purchase',
  'chemical-lot.sds': 'added a safety data sheet',
  'tank.create': 'added a tank',
  'tank.update': 'changed a tank',
  'tank.dip': 'recorded a tank dip reading',
  'tank.transfer': 'moved fuel between tanks',
  'pricing.create': 'set a new member price',
  'reservation.create': 'reserved fuel',
  'reservation.cancel': 'cancelled a reservation',
  'reservation.expire': 'let a reservation lapse',
  'draw.record': 'recorded a draw',
  'draw.reverse': 'reversed a draw',
  'billing.run.start': 'started preparing draft invoices',
  'billing.run.complete': 'finished preparing draft invoices',
  'billing.run.abandon': 'stopped a stalled invoice run',
  'billing.period.close': 'closed a month',
  'billing.adjustment.create': 'added a billing adjustment',
  'invoices.issue': 'issued the month’s invoices',
  'invoice.void': 'voided an invoice',
  'payment.record': 'recorded a payment',
  'payment.match': 'matched a payment',
  'payment.card.succeeded': 'received a card payment',
  'payment.attempt.start': 'started a card payment',
  'payment.attempt.failed': 'had a card payment declined',
  'refund.create': 'refunded money',
  'refund.failed': 'had a refund fail',
};

const STATUS: Record<string, string> = {
  planned: 'Planned',
  reacting: 'Reacting',
  settling: 'Settling',
  draining: 'Draining',
  washing: 'Washing',
  drying: 'Drying',
  testing: 'Testing',
  released: 'Released',
  rejected: 'Rejected',
};

/** "cost_per_liter" or "roadTaxCents" → "cost per liter", "road tax" (money and volume suffixes dropped: values carry units). */
export function fieldLabel(key: string): string {
  const words = key
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[_.-]+/g, ' ')
    .replace(/ (cents|liters)$/i, '')
    .toLowerCase()
    .trim();
  return words ? words[0]!.toUpperCase() + words.slice(1) : key;
}

/** "Ana Reyes moved batch #7 from Washing to Drying" — the event in a sentence. */
export function auditSentence(
  e: Pick<AuditEventDto, 'action' | 'actorName' | 'entityType' | 'entityId' | 'before' | 'after'>,
): string {
  const who = e.actorName ?? 'Tallyvat (automatic)';
  const b = (e.before ?? {}) as Record<string, unknown>;
  const a = (e.after ?? {}) as Record<string, unknown>;
  if (e.action === 'batch.advance' && typeof b.status === 'string' && typeof a.status === 'string') {
    return `${who} moved batch #${e.entityId} from ${STATUS[b.status] ?? b.status} to ${STATUS[a.status] ?? a.status}`;
  }
  if (e.action === 'membership.role-change' && typeof b.role === 'string' && typeof a.role === 'string') {
    return `${who} changed a member’s role from ${b.role} to ${a.role}`;
  }
  const did = DID[e.action];
  return did ? `${who} ${did}` : `${who}: ${fieldLabel(e.action)}`;
}
