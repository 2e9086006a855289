import 'server-only';
import type { Model, ModelStatic } from 'sequelize';
import { sequelize } from '@/lib/db';
import { AuditEvent } from './AuditEvent';
import { AuthToken } from './AuthToken';
import { Coop } from './Coop';
import { Invitation } from './Invitation';
import { MailSend } from './MailSend';
import { Membership } from './Membership';
import { SignInAttempt } from './SignInAttempt';
import { User } from './User';
// tank & draws
import { DipReading } from './DipReading';
import { Draw } from './Draw';
import { PricePolicy } from './PricePolicy';
import { Reservation } from './Reservation';
import { Tank } from './Tank';
import { TankMovement } from './TankMovement';
// brewing (supplies and batches)
import { Batch } from './Batch';
import { BatchFile } from './BatchFile';
import { BatchOilLot } from './BatchOilLot';
import { BatchStatusCount } from './BatchStatusCount';
import { BatchTemperature } from './BatchTemperature';
import { ChemicalConsumption } from './ChemicalConsumption';
import { ChemicalLot } from './ChemicalLot';
import { LowStockAlert } from './LowStockAlert';
import { OilLot } from './OilLot';
// lineage and reviews
import { BatchReview } from './BatchReview';
import { MovementBatchShare } from './MovementBatchShare';
import { TankLayer } from './TankLayer';
// Billing
import { BillingAdjustment } from './BillingAdjustment';
import { BillingPeriod } from './BillingPeriod';
import { BillingRun } from './BillingRun';
import { Invoice } from './Invoice';
import { InvoiceCounter } from './InvoiceCounter';
import { InvoiceLine } from './InvoiceLine';
import { MemberCredit } from './MemberCredit';
import { Payment } from './Payment';
import { PaymentAttempt } from './PaymentAttempt';
import { PaymentWebhookEvent } from './PaymentWebhookEvent';
import { Refund } from './Refund';

// Explicit wiring: every model is initialised here, once, and associations are declared in one place.
Coop.initModel(sequelize);
User.initModel(sequelize);
Membership.initModel(sequelize);
Invitation.initModel(sequelize);
AuthToken.initModel(sequelize);
AuditEvent.initModel(sequelize);
SignInAttempt.initModel(sequelize);
MailSend.initModel(sequelize);

Coop.hasMany(Membership, { foreignKey: 'coopId', as: 'memberships' });
Membership.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' });
Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
Invitation.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
Invitation.belongsTo(User, { foreignKey: 'invitedByUserId', as: 'invitedBy' });
AuthToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
AuditEvent.belongsTo(User, { foreignKey: 'actorUserId', as: 'actor' });
AuditEvent.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
User.hasMany(AuditEvent, { foreignKey: 'actorUserId', as: 'auditEvents' });

// tank & draws
for (const m of [Tank, TankMovement, PricePolicy, Reservation, Draw, DipReading]) m.initModel(sequelize);
Tank.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
TankMovement.belongsTo(Tank, { foreignKey: 'tankId', as: 'tank' });
TankMovement.belongsTo(User, { foreignKey: 'createdByUserId', as: 'createdBy' });
PricePolicy.belongsTo(User, { foreignKey: 'createdByUserId', as: 'createdBy' });
Reservation.belongsTo(Tank, { foreignKey: 'tankId', as: 'tank' });
Reservation.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
Draw.belongsTo(Tank, { foreignKey: 'tankId', as: 'tank' });
Draw.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
DipReading.belongsTo(Tank, { foreignKey: 'tankId', as: 'tank' });
// tank & draws: joins of the ledger, draw and reservation lists
TankMovement.belongsTo(Tank, { foreignKey: 'transferTankId', as: 'transferTank' });
TankMovement.belongsTo(Draw, { foreignKey: 'drawId', as: 'draw' });
Draw.hasOne(Draw, { foreignKey: 'reversesDrawId', as: 'reversal' });
Draw.belongsTo(User, { foreignKey: 'recordedByUserId', as: 'recordedBy' });
Reservation.hasOne(Draw, { foreignKey: 'reservationId', as: 'draw' });

// brewing: supplies and batches (child rows are read with explicit queries; no eager loading)
for (const m of [ChemicalLot, OilLot, Batch, BatchOilLot, BatchTemperature, ChemicalConsumption, BatchFile])
  m.initModel(sequelize);
for (const m of [
  ChemicalLot,
  OilLot,
  Batch,
  BatchOilLot,
  BatchTemperature,
  ChemicalConsumption,
  BatchFile,
] as ModelStatic<Model>[]) {
  m.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
}
for (const m of [ChemicalLot, OilLot, Batch, BatchTemperature] as ModelStatic<Model>[])
  m.belongsTo(User, { foreignKey: 'createdByUserId', as: 'createdBy' });
BatchFile.belongsTo(User, { foreignKey: 'uploadedByUserId', as: 'uploadedBy' });
ChemicalConsumption.belongsTo(ChemicalLot, { foreignKey: 'chemicalLotId', as: 'lot' });
BatchOilLot.belongsTo(OilLot, { foreignKey: 'oilLotId', as: 'oilLot' });
Batch.hasMany(BatchTemperature, { foreignKey: 'batchId', as: 'temperatures' });
Batch.hasMany(BatchOilLot, { foreignKey: 'batchId', as: 'oilLots' });
Batch.hasMany(ChemicalConsumption, { foreignKey: 'batchId', as: 'consumptions' });
Batch.hasMany(BatchFile, { foreignKey: 'batchId', as: 'files' });
for (const m of [BatchStatusCount, LowStockAlert]) m.initModel(sequelize);

// lineage: a tank's fuel by batch, the batches each ledger row moved, batch reviews (recalls)
for (const m of [TankLayer, MovementBatchShare, BatchReview]) m.initModel(sequelize);
TankLayer.belongsTo(Batch, { foreignKey: 'batchId', as: 'batch' });
TankLayer.belongsTo(Tank, { foreignKey: 'tankId', as: 'tank' });
MovementBatchShare.belongsTo(Batch, { foreignKey: 'batchId', as: 'batch' });
MovementBatchShare.belongsTo(Tank, { foreignKey: 'tankId', as: 'tank' });
MovementBatchShare.belongsTo(Draw, { foreignKey: 'drawId', as: 'draw' });
MovementBatchShare.belongsTo(TankMovement, { foreignKey: 'movementId', as: 'movement' });
BatchReview.belongsTo(Batch, { foreignKey: 'batchId', as: 'batch' });

// Billing: invoices, lines, payments, refunds, credit, adjustments, runs, months, provider events.
InvoiceCounter.initModel(sequelize);
for (const m of [
  BillingPeriod,
  BillingRun,
  BillingAdjustment,
  Invoice,
  InvoiceLine,
  PaymentAttempt,
  Payment,
  Refund,
  MemberCredit,
  PaymentWebhookEvent,
])
  m.initModel(sequelize);
Invoice.hasMany(InvoiceLine, { foreignKey: 'invoiceId', as: 'lines' });
InvoiceLine.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
Invoice.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
Payment.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
Payment.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
Refund.belongsTo(Payment, { foreignKey: 'paymentId', as: 'payment' });
Invoice.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
Invoice.hasOne(Invoice, { foreignKey: 'creditNoteForId', as: 'creditNote' });
Invoice.belongsTo(Invoice, { foreignKey: 'creditNoteForId', as: 'original' });
PaymentAttempt.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
BillingAdjustment.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
BillingAdjustment.hasOne(InvoiceLine, { foreignKey: 'adjustmentId', as: 'billedLine' });

export { sequelize, AuditEvent, AuthToken, Coop, Invitation, MailSend, Membership, SignInAttempt, User };
export { DipReading, Draw, PricePolicy, Reservation, Tank, TankMovement };
export {
  Batch,
  BatchFile,
  BatchOilLot,
  BatchStatusCount,
  BatchTemperature,
  ChemicalConsumption,
  ChemicalLot,
  LowStockAlert,
  OilLot,
};
export { BatchReview, MovementBatchShare, TankLayer };
export {
  BillingAdjustment,
  BillingPeriod,
  BillingRun,
  Invoice,
  InvoiceCounter,
  InvoiceLine,
  MemberCredit,
  Payment,
  PaymentAttempt,
  PaymentWebhookEvent,
  Refund,
};

// server-side sessions (sign-out revokes the row; requireMember includes it in its one query)
import { Session } from './Session';
Session.initModel(sequelize);
User.hasMany(Session, { foreignKey: 'userId', as: 'sessions' });
Session.belongsTo(User, { foreignKey: 'userId', as: 'user' });
export { Session };

// imports from spreadsheets (issue 20)
import { Import } from './Import';
Import.initModel(sequelize);
Import.belongsTo(User, { foreignKey: 'createdByUserId', as: 'createdBy' });
Invitation.belongsTo(Import, { foreignKey: 'importId', as: 'import' });
export { Import };

// personal access tokens (lib/auth/api-tokens.ts): one co-op, their creator's role there
import { ApiToken } from './ApiToken';
ApiToken.initModel(sequelize);
ApiToken.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
ApiToken.belongsTo(User, { foreignKey: 'createdByUserId', as: 'createdBy' });
export { ApiToken };
