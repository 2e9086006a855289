// The typed client (lib/api/client) gives components the contract's exact answers: the
// expectations below are checked by `tsc --noEmit` (typecheck, .ci), and a component that reads
// a field the contract does not declare fails to compile the same way the @ts-expect-error
// lines here would if the field existed. The runtime checks hold the document to exact objects.
import { describe, expect, expectTypeOf, it } from 'vitest';
import { openApiDocument } from '@/lib/api/document';
import type { paths } from '@/lib/api/client';
import type { DrawDto } from '@/lib/tank/draws';
import type { InvoiceDetail, PaymentDTO } from '@/lib/billing/types';
import type { PeriodOverview } from '@/lib/billing/months';
import type { MemberDto } from '@/lib/members';
import type { TankDto } from '@/lib/tank';
import type { ProfileDto } from '@/lib/account';
import type { AuditEventDto } from '@/lib/audit/types';
import type { BatchDto, BatchSummaryDto, TemperatureDto } from '@/lib/brewing/read';
import type { PlannerResult } from '@/lib/brewing/planner';
import type { Reconciliation } from '@/lib/billing/reconciliation';
import type { CoopSettingsDto } from '@/lib/coops/settings-types';
import type { Overview } from '@/lib/overview/types';
import type { ImportDetail } from '@/lib/imports';
import type { BatchLineage, TankLayersDto } from '@/lib/lineage';
import type { InvitationInfo } from '@/lib/members/invitations';
import type { QuarterlyReport } from '@/lib/reports/quarterly';

type Json<P extends keyof paths, M extends keyof paths[P], S extends number> = paths[P][M] extends {
  responses: Record<S, { content: { 'application/json': infer B } }>;
}
  ? B
  : never;

type Tanks = Json<'/api/coops/{coop}/tanks', 'get', 200>;
type Tank = Tanks['tanks'][number];
type Draws = Json<'/api/coops/{coop}/draws', 'get', 200>;
type Invoice = Json<'/api/coops/{coop}/invoices/{id}', 'get', 200>;
type Period = Json<'/api/coops/{coop}/billing/periods/{period}', 'get', 200>;
type Members = Json<'/api/coops/{coop}/members', 'get', 200>;
type Payment = Json<'/api/coops/{coop}/billing/payments', 'post', 201>;
type Batch = Json<'/api/coops/{coop}/batches/{id}', 'get', 200>;

describe("the typed client answers with the services' DTOs, field for field", () => {
  it('types', () => {
    expectTypeOf<Tank>().toEqualTypeOf<TankDto>();
    expectTypeOf<Draws['items'][number]>().toEqualTypeOf<DrawDto>();
    expectTypeOf<Invoice>().toEqualTypeOf<InvoiceDetail>();
    expectTypeOf<Period>().toEqualTypeOf<PeriodOverview>();
    expectTypeOf<Members['rows'][number]>().toEqualTypeOf<MemberDto>();
    expectTypeOf<Payment>().toEqualTypeOf<PaymentDTO>();
    expectTypeOf<Tank['availableLiters']>().toEqualTypeOf<number>();
    expectTypeOf<Tank['mixing']>().toEqualTypeOf<'mixed' | 'fifo'>();
    // Lab results are keyed by property in the DTO; JSON Schema's record comes out as a string index.
    expectTypeOf<Omit<Extract<Batch, { view: 'full' }>, 'labResults'>>().toEqualTypeOf<Omit<BatchDto, 'labResults'>>();
    expectTypeOf<Extract<Batch, { view: 'summary' }>>().toEqualTypeOf<BatchSummaryDto>();
    expectTypeOf<Json<'/api/coops/{coop}/batches/{id}/temperatures', 'post', 201>>().toEqualTypeOf<TemperatureDto>();
    expectTypeOf<Json<'/api/coops/{coop}/planner', 'post', 200>>().toEqualTypeOf<PlannerResult>();
    expectTypeOf<
      Json<'/api/coops/{coop}/billing/periods/{period}/reconciliation', 'get', 200>
    >().toEqualTypeOf<Reconciliation>();
    expectTypeOf<Json<'/api/coops/{coop}/overview', 'get', 200>>().toEqualTypeOf<Overview>();
    expectTypeOf<Json<'/api/me', 'get', 200>>().toEqualTypeOf<ProfileDto>();
    expectTypeOf<Json<'/api/coops/{coop}/settings', 'get', 200>>().toEqualTypeOf<CoopSettingsDto>();
    expectTypeOf<Json<'/api/coops/{coop}/audit', 'get', 200>['rows'][number]>().toEqualTypeOf<AuditEventDto>();
    expectTypeOf<Json<'/api/coops/{coop}/imports/{kind}/{id}', 'get', 200>>().toEqualTypeOf<ImportDetail>();
    // byKind is keyed by ledger kind in the DTO; JSON Schema's record comes out as a string index.
    expectTypeOf<Omit<Json<'/api/coops/{coop}/batches/{id}/lineage', 'get', 200>, 'byKind'>>().toEqualTypeOf<
      Omit<BatchLineage, 'byKind'>
    >();
    expectTypeOf<Json<'/api/coops/{coop}/tanks/{tankId}/layers', 'get', 200>>().toEqualTypeOf<TankLayersDto>();
    expectTypeOf<Json<'/api/coops/{coop}/reports/quarterly', 'get', 200>>().toEqualTypeOf<QuarterlyReport>();
    expectTypeOf<Json<'/api/invitations/{token}', 'get', 200>>().toEqualTypeOf<InvitationInfo>();
  });

  it('refuses a field the contract does not declare (a renamed field is a compile error)', () => {
    // A component reading these would not compile: the lines below only compile because each expects the error.
    const reads = (tank: Tank, invoice: Invoice, period: Period) => [
      // @ts-expect-error tanks have availableLiters, not available_liters
      tank.available_liters,
      // @ts-expect-error an invoice's amount is totalCents
      invoice.total,
      // @ts-expect-error the month's counts have no "open"
      period.counts.open,
    ];
    expect(typeof reads).toBe('function');
  });
});

describe('the document declares exact objects for the DTOs the screens read', () => {
  const schemas = (
    openApiDocument() as unknown as { components: { schemas: Record<string, { additionalProperties?: unknown }> } }
  ).components.schemas;
  it.each([
    'Tank',
    'TankMovement',
    'Reservation',
    'Draw',
    'PricePolicy',
    'InvoiceSummary',
    'InvoiceDetail',
    'Payment',
    'Refund',
    'BillingRun',
    'Adjustment',
    'PeriodOverview',
    'ChemicalLot',
    'OilLot',
    'StockSummary',
    'BatchRow',
    'Member',
    'Invitation',
    'ApiToken',
    'Batch',
    'BatchSummary',
    'Temperature',
    'ComputedPlan',
    'PlannerResult',
    'Reconciliation',
    'Overview',
    'Profile',
    'CoopSettings',
    'AuditEvent',
    'InvitationAccepted',
    'InvitationInfo',
    'Import',
    'ImportDetail',
    'InvitationImportPreview',
    'OpeningImportPreview',
    'BatchLineage',
    'BatchReview',
    'RecallReport',
    'TankLayers',
    'QuarterlyReport',
    'BatchFile',
  ])('%s allows no undeclared field', (id) => {
    expect(schemas[id], `components.schemas.${id}`).toBeDefined();
    expect(schemas[id]!.additionalProperties).toBe(false);
  });
});
