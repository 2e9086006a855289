import type { Role } from '@/lib/auth/roles';
import type { PricingPolicy } from '@/lib/pricing';

export interface TankSummary {
  onHandLiters: string;
  reservedLiters: string;
  /** Held while a batch in it is under review (reserved fuel included): on hand, not for drawing. */
  heldLiters: string;
  availableLiters: string;
  capacityLiters: string;
  avgCostCentsPerGallon: number | null;
  tanks: number;
}

export interface PriceSummary {
  kind: PricingPolicy['kind'];
  /** Off-road/heating price per gallon (base + surcharge), cents; road adds roadTaxCentsPerGallon. */
  centsPerGallon: number;
  roadTaxCentsPerGallon: number;
}

export interface MonthVolume {
  month: string;
  releasedLiters: number;
  drawnLiters: number;
}

export interface Overview {
  role: Role;
  tank: TankSummary;
  price: PriceSummary | null;
  volumes: MonthVolume[];
  tankLevel: { day: string; onHandLiters: number }[];
  member: { openReservations: { id: number; tankName: string; quantityLiters: string; windowEnd: string }[] };
  /** My own account: unpaid balance of issued invoices and credit held (everyone is a member). */
  account: { outstandingCents: number; creditCents: number; unallocatedCents: number };
  /** Brewers and admins. */
  brewer?: BrewerSection;
  /** Treasurers and admins. */
  treasurer?: TreasurerSection;
  /** Brewers, treasurers and admins: the last released batches' cost per gallon, oldest first. */
  batchCosts?: BatchCost[];
  /** Treasurers and admins: who owes the most. */
  balances?: { topOwing: { membershipId: number; name: string; outstandingCents: number }[]; membersOwing: number; totalOutstandingCents: number };
  admin?: { pendingInvitations: number; notSentInvitations: number; recentEvents: { at: string; who: string | null; action: string }[] };
}

/** A batch's quality in the one wording of lib/quality: "Meets …", "Fails: …" or "Screened — n of m …". */
export interface QualityWording { text: string; kind: 'meets' | 'fails' | 'screened' }

export interface BrewerSection {
  inProgress: { id: number; number: number; status: string; oilLiters: number; since: string; quality: QualityWording | null }[];
  /** The latest released batches, newest first, with their verdicts. */
  recentReleased: { id: number; number: number; releasedAt: string; releasedLiters: number; quality: QualityWording }[];
  nextPlanned: { id: number; number: number; batchDate: string; oilLiters: number; catalyst: 'KOH' | 'NaOH' } | null;
  /** Stock of the chemicals the next planned batch uses: methanol in litres, catalyst in grams. */
  stock: { kind: 'methanol' | 'KOH' | 'NaOH'; unit: 'L' | 'g'; available: number; need: number; low: boolean }[];
}

export interface TreasurerSection {
  /** YYYY-MM in the co-op's time zone. */
  period: string;
  invoicedCents: number;
  paidCents: number;
  outstandingCents: number;
  /** Issued invoices of the month, and drafts not issued yet. */
  invoices: number;
  drafts: number;
  /** Payments (any month) with money not yet matched to an invoice. */
  unmatchedPayments: number;
  unmatchedCents: number;
}

/** One released batch's cost per US gallon, split by kind (cents, may carry fractions). */
export interface BatchCost {
  number: number;
  releasedOn: string;
  releasedLiters: number;
  methanol: number;
  catalyst: number;
  energy: number;
  feedstock: number;
  other: number;
  totalCentsPerGallon: number;
}
