import { invitationAcceptSchema } from './auth';

// Every schema a form checks a body with before sending it: the very ones the route handlers
// parse with. Forms name them (`schema: 'dipCreateSchema'`) and components/forms/use-api-form
// loads this module on its own after the page has loaded, so zod is never part of a page's
// first-load JavaScript.

export { apiTokenCreateSchema } from './api-tokens';
export {
  coopCreateSchema,
  emailChangeSchema,
  emailConfirmSchema,
  invitationAcceptSchema,
  invitationCreateSchema,
  membershipUpdateSchema,
  passwordChangeSchema,
  passwordResetRequestSchema,
  passwordResetSchema,
  profileUpdateSchema,
  signInSchema,
} from './auth';
export {
  adjustmentCreateSchema,
  billingRunCreateSchema,
  cardPaySchema,
  invoiceVoidSchema,
  paymentMatchSchema,
  paymentRecordSchema,
  periodCloseSchema,
  refundCreateSchema,
} from './billing';
export {
  batchAdvanceSchema,
  batchCreateSchema,
  batchRejectSchema,
  batchReleaseSchema,
  batchUpdateSchema,
  chemicalLotCreateSchema,
  oilLotCreateSchema,
  plannerSchema,
  temperatureCreateSchema,
} from './brewing';
export { importFileSchema } from './imports';
export { lateLabResultSchema, reviewCloseSchema, reviewOpenSchema } from './lineage';
export { coopSettingsUpdateSchema } from './settings';
export {
  dipCreateSchema,
  drawCreateSchema,
  drawReverseSchema,
  pricingPolicyCreateSchema,
  reservationCreateSchema,
  tankCreateSchema,
  tankUpdateSchema,
  transferCreateSchema,
} from './tank';

/** Accepting an invitation with a new account: name and password are both required. */
export const newAccountAcceptSchema = invitationAcceptSchema.required();
