import type { Role } from '@/lib/auth/roles';
import type { PricingPolicy } from '@/lib/pricing';

export interface TankSummary {
  onHandLiters: string;
  reservedLiters: string;
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
  admin?: { pendingInvitations: number; notSentInvitations: number; recentEvents: { at: string; who: string | null; action: string }[] };
}
