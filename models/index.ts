import 'server-only';
import { sequelize } from '@/lib/db';
import { AuditEvent } from './AuditEvent';
import { AuthToken } from './AuthToken';
import { Coop } from './Coop';
import { Invitation } from './Invitation';
import { Membership } from './Membership';
import { SignInAttempt } from './SignInAttempt';
import { User } from './User';
// Billing
import { BillingAdjustment } from './BillingAdjustment';
import { BillingPeriod } from './BillingPeriod';
import { BillingRun } from './BillingRun';
import { Invoice } from './Invoice';
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

Coop.hasMany(Membership, { foreignKey: 'coopId', as: 'memberships' });
Membership.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' });
Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
Invitation.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });
Invitation.belongsTo(User, { foreignKey: 'invitedByUserId', as: 'invitedBy' });
AuthToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
AuditEvent.belongsTo(User, { foreignKey: 'actorUserId', as: 'actor' });
AuditEvent.belongsTo(Coop, { foreignKey: 'coopId', as: 'coop' });

// Billing: invoices, lines, payments, refunds, credit, adjustments, runs, months, provider events.
for (const m of [BillingPeriod, BillingRun, BillingAdjustment, Invoice, InvoiceLine, PaymentAttempt, Payment, Refund, MemberCredit, PaymentWebhookEvent]) m.initModel(sequelize);
Invoice.hasMany(InvoiceLine, { foreignKey: 'invoiceId', as: 'lines' });
InvoiceLine.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
Invoice.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
Payment.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
Payment.belongsTo(Membership, { foreignKey: 'membershipId', as: 'membership' });
Refund.belongsTo(Payment, { foreignKey: 'paymentId', as: 'payment' });


export { sequelize, AuditEvent, AuthToken, Coop, Invitation, Membership, SignInAttempt, User };
export { BillingAdjustment, BillingPeriod, BillingRun, Invoice, InvoiceLine, MemberCredit, Payment, PaymentAttempt, PaymentWebhookEvent, Refund };
