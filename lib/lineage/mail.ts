import 'server-only';
import { appUrl } from '@/lib/mail';
import { RECALL_CAUTIONS, RECALL_DEFERENCE } from '@/lib/safety';
import { formatMl } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';

// The plain-text e-mails of a batch review. Sent through the job queue (lib/jobs enqueueMail)
// inside the transaction that opens or closes the review, so they exist exactly when it commits.

interface Ctx {
  coopName: string;
  coopSlug: string;
  units: UnitSystem;
  batchNumber: number;
  contacts: { name: string; email: string }[];
}

const contactLines = (c: Ctx) =>
  c.contacts.length ? c.contacts.map((p) => `  ${p.name} <${p.email}>`).join('\n') : '  your co-op’s brewers';

/** To a member who drew some of the batch: what was found, how much they received, the cautions, whom to contact. */
export function recallMail(
  c: Ctx,
  m: { name: string; email: string; batchMl: number; drawCount: number },
  finding: string,
) {
  return {
    to: m.email,
    subject: `${c.coopName}: fuel from batch ${c.batchNumber} is under review — please stop using it on the road`,
    text: [
      `Hello ${m.name},`,
      '',
      `Batch ${c.batchNumber} of ${c.coopName}'s fuel is under review. What was found:`,
      `  ${finding}`,
      '',
      `Your draws (${m.drawCount}) since its release included about ${formatMl(m.batchMl, c.units, { digits: 2 })} of fuel from this batch.`,
      '',
      'Please:',
      ...RECALL_CAUTIONS.map((t) => `- ${t}`),
      '',
      RECALL_DEFERENCE,
      '',
      'The rest of this batch in the co-op’s tanks is held and cannot be reserved or drawn until the review ends. We will e-mail you the outcome.',
      '',
      'Who to contact:',
      contactLines(c),
      '',
      `Details: ${appUrl(`/c/${c.coopSlug}`)}`,
    ].join('\n'),
  };
}

/** To a member with an open reservation on a tank whose fuel is now held. */
export function reservationHeldMail(c: Ctx, m: { name: string; email: string; tankName: string }) {
  return {
    to: m.email,
    subject: `${c.coopName}: your reservation at ${m.tankName} is on hold`,
    text: [
      `Hello ${m.name},`,
      '',
      `Fuel in ${m.tankName} is held while batch ${c.batchNumber} is under review, so your open reservation there cannot be filled for now.`,
      'You may cancel it, or keep it and wait for the outcome, which we will e-mail to the members who drew this batch and show on the tank page.',
      '',
      'Who to contact:',
      contactLines(c),
      '',
      `Your reservations: ${appUrl(`/c/${c.coopSlug}/tank`)}`,
    ].join('\n'),
  };
}

const OUTCOME_TEXT = {
  cleared: 'The review found the fuel fit to use again: it is released for reserving and drawing.',
  retreated:
    'The fuel left in the tanks was taken out to be re-processed in a new batch; it will come back only after that batch passes its tests.',
  disposed: 'The fuel left in the tanks was disposed of.',
} as const;

/** The follow-up when the review closes. */
export function outcomeMail(
  c: Ctx,
  m: { name: string; email: string; batchMl: number },
  outcome: keyof typeof OUTCOME_TEXT,
  notes: string,
) {
  return {
    to: m.email,
    subject: `${c.coopName}: review of batch ${c.batchNumber} closed — ${outcome === 'cleared' ? 'cleared' : outcome === 'retreated' ? 're-treated' : 'disposed of'}`,
    text: [
      `Hello ${m.name},`,
      '',
      `The review of batch ${c.batchNumber} is closed. ${OUTCOME_TEXT[outcome]}`,
      `Notes: ${notes}`,
      '',
      `You received about ${formatMl(m.batchMl, c.units, { digits: 2 })} of this batch.`,
      outcome === 'cleared'
        ? 'If your vehicle or equipment showed any of the signs we wrote about, still have it checked by a qualified mechanic or technician.'
        : 'If you still have some of this fuel, do not use it in road vehicles; ask us how to return it. If your vehicle or equipment ran badly, have it checked by a qualified mechanic or technician.',
      RECALL_DEFERENCE,
      ...(outcome === 'cleared' ? [] : ['The treasurer will be in touch about a credit for the fuel you drew.']),
      '',
      'Who to contact:',
      contactLines(c),
    ].join('\n'),
  };
}
