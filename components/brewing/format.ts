// Display helpers for the brewing screens (pure: safe in server and client components).
import { formatDate } from '@/lib/dates';
import { formatCents } from '@/lib/money';
import { formatVolume, volumeFromLiters, volumeLabel, type UnitSystem } from '@/lib/units';

export const STATUS_LABELS: Record<string, string> = {
  planned: 'Planned',
  reacting: 'Reacting',
  settling: 'Settling',
  draining: 'Draining',
  washing: 'Washing',
  drying: 'Drying',
  testing: 'Testing',
  released: 'Released',
  rejected: 'Rejected',
  'in-progress': 'In progress',
  imported: 'Imported summary',
};

export const STEP_ORDER = ['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;

/** Badge colours (WCAG AA text on tinted backgrounds from the palette). */
export function statusTone(status: string): string {
  if (status === 'released') return 'bg-ok-50 text-ok-700 border-ok-600/30';
  if (status === 'rejected') return 'bg-danger-50 text-danger-700 border-danger-600/30';
  if (status === 'planned') return 'bg-stone-100 text-stone-800 border-stone-300';
  return 'bg-amber-50 text-amber-800 border-amber-300';
}

export function verdictTone(v: string): string {
  if (v === 'pass' || v === 'meets' || v === 'looks-good') return 'bg-ok-50 text-ok-700 border-ok-600/30';
  if (v === 'fail' || v === 'fails' || v === 'needs-attention')
    return 'bg-danger-50 text-danger-700 border-danger-600/30';
  if (v === 'screened-outside') return 'bg-warn-50 text-warn-700 border-warn-600/30';
  return 'bg-stone-100 text-stone-800 border-stone-300';
}

export const VERDICT_LABELS: Record<string, string> = {
  pass: 'Pass',
  fail: 'Fail',
  incomplete: 'Screened',
  'not tested': 'Not tested',
  reported: 'Reported',
  'screened-within': 'Within limit (screening only)',
  'screened-outside': 'Outside limit (screening only)',
  'looks-good': 'Looks good',
  'needs-attention': 'Needs attention',
  recorded: 'Recorded',
};

export const vol = (liters: number | null | undefined, units: UnitSystem, digits = 1) =>
  liters == null ? '—' : formatVolume(liters, units, digits);
export const money = (cents: number | null | undefined, currency = 'USD') =>
  cents == null ? '—' : formatCents(cents, currency);

/** Cost per gallon (US co-ops) or per litre (metric co-ops), e.g. "$2.30/gal". */
export function perUnit(
  perGallonCents: number | null,
  perLiterCents: number | null,
  units: UnitSystem,
  currency = 'USD',
): string {
  const cents = units === 'us' ? perGallonCents : perLiterCents;
  return cents == null ? '—' : `${formatCents(cents, currency)}/${volumeLabel(units)}`;
}

export function grams(g: number | null | undefined): string {
  if (g == null) return '—';
  return g >= 1000
    ? `${(g / 1000).toLocaleString('en-US', { maximumFractionDigits: 3 })} kg`
    : `${g.toLocaleString('en-US', { maximumFractionDigits: 1 })} g`;
}

/** A day ("Dec 3, 2026"); a moment is shown in `timeZone` (the co-op's), a bare date as itself. */
export function dateText(iso: string | null | undefined, timeZone = 'UTC'): string {
  return iso ? formatDate(iso, timeZone) : '—';
}

// Default values of the batch record's form fields ('' when nothing is recorded yet).

/** A number to `digits` places, without trailing zeros. */
export const fieldNumber = (v: number | null, digits: number) => (v === null ? '' : String(Number(v.toFixed(digits))));
/** A volume in the co-op's unit, to two places. */
export const fieldVolume = (liters: number | null, units: UnitSystem) =>
  liters === null ? '' : String(Number(volumeFromLiters(liters, units).toFixed(2)));
/** Cents as an amount ("12.50"). */
export const fieldMoney = (c: number | null) => (c === null ? '' : (c / 100).toFixed(2));
