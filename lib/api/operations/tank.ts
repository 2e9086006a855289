import { z } from 'zod';
import {
  dipCreateSchema,
  drawCreateSchema,
  drawListSchema,
  drawReverseSchema,
  movementListSchema,
  pricingPolicyCreateSchema,
  reservationCreateSchema,
  reservationListSchema,
  tankCreateSchema,
  tankUpdateSchema,
  transferCreateSchema,
} from '@/lib/validation/tank';
import { operation } from '../operation';
import { dipResultSchema, drawSchema, itemsOf, movementSchema, pricePolicySchema, reservationSchema, tankSchema } from '../schemas';

// The tank, pricing, reservations and draws.

const tags = ['Tank'];
const units = z.enum(['us', 'metric']);

export const operations = [
  operation({ method: 'GET', path: '/api/coops/[coop]/tanks', summary: 'Tanks with on hand, reserved and available', access: { action: 'tank:read' }, responses: { 200: z.object({ tanks: z.array(tankSchema), units }) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/tanks', summary: 'Add a tank', access: { action: 'tank:write' }, body: tankCreateSchema, responses: { 201: tankSchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/tanks/[tankId]', summary: 'One tank', access: { action: 'tank:read' }, responses: { 200: tankSchema }, tags }),
  operation({ method: 'PATCH', path: '/api/coops/[coop]/tanks/[tankId]', summary: 'Rename, resize, or take a tank out of service', access: { action: 'tank:write' }, body: tankUpdateSchema, responses: { 200: tankSchema }, errors: { 409: 'Out of service only when empty.' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/tanks/[tankId]/movements', summary: 'The tank\'s ledger', access: { action: 'draws:read-all' }, query: movementListSchema, responses: { 200: itemsOf(movementSchema) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/tanks/[tankId]/dips', summary: 'Record a dip reading (the difference becomes a ledger row)', access: { action: 'tank:write' }, body: dipCreateSchema, responses: { 201: dipResultSchema }, errors: { 409: 'Below what is reserved.' }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/tanks/transfers', summary: 'Move fuel between tanks', access: { action: 'tank:write' }, body: transferCreateSchema, responses: { 201: z.object({ from: tankSchema, to: tankSchema }) }, errors: { 409: 'Reserved fuel or capacity in the way.' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/pricing', summary: 'The member price in force and its history', access: { action: 'tank:read' }, responses: { 200: z.object({ current: pricePolicySchema.nullable(), policies: z.array(pricePolicySchema), units }) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/pricing', summary: 'Set a new price policy (history is insert-only)', access: { action: 'pricing:write' }, body: pricingPolicyCreateSchema, responses: { 201: pricePolicySchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/reservations', summary: 'Reservations (my own; all with filters for staff)', access: { action: 'reservations:own' }, query: reservationListSchema, responses: { 200: itemsOf(reservationSchema) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/reservations', summary: 'Reserve fuel for a pick-up window', access: { action: 'reservations:own' }, body: reservationCreateSchema, responses: { 201: reservationSchema }, errors: { 409: 'The tank cannot cover it (`availableLiters`, `available`).' }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/reservations/[reservationId]/cancel', summary: 'Cancel an open reservation', access: { action: 'reservations:own', note: 'its owner; brewers and admins any' }, responses: { 200: reservationSchema }, errors: { 409: 'Not open.' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/draws', summary: 'Draws (my own; all with filters for staff) and totals', access: { action: 'reservations:own' }, query: drawListSchema, responses: { 200: itemsOf(drawSchema).extend({ totals: z.object({ quantityLiters: z.number(), quantity: z.number(), totalCents: z.number().int() }) }) }, tags }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/draws',
    summary: 'Record a draw (the price in force is locked onto it)',
    access: { action: 'draws:record', note: 'a member for themself where the co-op allows self-serve draws' },
    body: drawCreateSchema,
    responses: { 201: drawSchema },
    errors: { 409: 'Not enough fuel, a closed month, or a reservation that does not fit.' },
    tags,
  }),
  operation({ method: 'POST', path: '/api/coops/[coop]/draws/[drawId]/reverse', summary: 'Reverse a draw (once)', access: { action: 'draws:record' }, body: drawReverseSchema, responses: { 201: drawSchema }, errors: { 409: 'Already reversed, or a closed month.' }, tags }),
];
