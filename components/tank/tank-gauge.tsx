import { formatCents } from '@/lib/money';
import { formatWhen } from '@/lib/dates';
import { formatMl } from '@/lib/tank/volume';
import { volumeLabel, type UnitSystem } from '@/lib/units';

/** What a gauge needs (a subset of the tank DTO, so SWR data can be passed straight in). */
export interface GaugeTank {
  id: number;
  name: string;
  active: boolean;
  capacityLiters: number;
  onHandLiters: number;
  reservedLiters: number;
  availableLiters: number;
  /** Held while a batch in the tank is under review (optional for callers without lineage). */
  heldLiters?: number;
  avgCostCentsPerUnit: number | null;
  lastDipAt: string | null;
}

const HATCH = 'repeating-linear-gradient(135deg, #b45f06 0 6px, #fbbb4d 6px 12px)';

/** The legend swatches match the bar: reserved is hatched, available solid — never colour alone. */
export function Swatch({ kind }: { kind: 'reserved' | 'available' }) {
  return (
    <span
      aria-hidden="true"
      className={`mr-1.5 inline-block h-3 w-3 rounded-sm align-[-1px] ${kind === 'available' ? 'bg-fir-600' : 'border border-amber-700'}`}
      style={kind === 'reserved' ? { backgroundImage: HATCH } : undefined}
    />
  );
}

/**
 * One tank's level: a bar of capacity with the reserved (hatched) and available (solid) parts of
 * what is on hand, and the same figures as text. The bar is an image with a full text
 * alternative; the figures below it are the real content.
 */
export function TankGauge({
  tank,
  units,
  currency = 'USD',
  timeZone,
}: {
  tank: GaugeTank;
  units: UnitSystem;
  currency?: string;
  timeZone: string;
}) {
  const ml = (l: number) => Math.round(l * 1000);
  const cap = Math.max(1, ml(tank.capacityLiters));
  const pct = (l: number) => Math.max(0, Math.min(100, (ml(l) / cap) * 100));
  const full = Math.round(pct(tank.onHandLiters));
  const fmt = (l: number, floor = false) => formatMl(ml(l), units, { floor });
  const held = tank.heldLiters ?? 0;
  const alt = `${tank.name}: ${fmt(tank.onHandLiters)} on hand of ${fmt(tank.capacityLiters)} (${full}% full); ${fmt(tank.reservedLiters)} reserved; ${held > 0 ? `${fmt(held)} held while a batch is under review; ` : ''}${fmt(tank.availableLiters, true)} available.`;
  return (
    <article
      aria-labelledby={`tank-${tank.id}-name`}
      className="rounded-xl border border-stone-200 bg-white p-4 shadow-sm"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 id={`tank-${tank.id}-name`} className="text-base font-semibold text-fir-900">
          {tank.name}
        </h3>
        {tank.active ? (
          <span className="text-sm text-stone-600">{full}% full</span>
        ) : (
          <span className="rounded bg-stone-200 px-2 py-0.5 text-xs font-semibold uppercase tracking-wide text-stone-800">
            Out of service
          </span>
        )}
      </div>
      <div
        role="img"
        aria-label={alt}
        className="mt-3 flex h-7 w-full overflow-hidden rounded-md border border-stone-300 bg-stone-100"
      >
        <div style={{ width: `${pct(tank.reservedLiters)}%`, backgroundImage: HATCH }} />
        <div className="bg-fir-600" style={{ width: `${pct(tank.availableLiters)}%` }} />
      </div>
      <dl className="mt-3 grid grid-cols-3 gap-2 text-sm">
        <div>
          <dt className="text-stone-600">On hand</dt>
          <dd className="font-semibold tabular-nums text-stone-900">{fmt(tank.onHandLiters)}</dd>
        </div>
        <div>
          <dt className="text-stone-600">
            <Swatch kind="reserved" />
            Reserved
          </dt>
          <dd className="font-semibold tabular-nums text-stone-900">{fmt(tank.reservedLiters)}</dd>
        </div>
        <div>
          <dt className="text-stone-600">
            <Swatch kind="available" />
            Available
          </dt>
          <dd className="font-semibold tabular-nums text-fir-800" data-testid={`available-${tank.id}`}>
            {fmt(tank.availableLiters, true)}
          </dd>
        </div>
      </dl>
      {held > 0 ? (
        <p className="mt-2 text-sm font-semibold text-danger-700">
          {fmt(held)} held: a batch in this tank is under review, so this fuel cannot be reserved or drawn.
        </p>
      ) : null}
      <p className="mt-2 text-xs text-stone-600">
        Capacity {fmt(tank.capacityLiters)}
        {tank.avgCostCentsPerUnit !== null
          ? ` · average cost ${formatCents(Math.round(tank.avgCostCentsPerUnit), currency)}/${volumeLabel(units)}`
          : ''}
        {tank.lastDipAt
          ? ` · last dip ${formatWhen(tank.lastDipAt, timeZone, { time: false })}`
          : ' · no dip reading yet'}
      </p>
    </article>
  );
}
