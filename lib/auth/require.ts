import 'server-only';
import { forbidden } from '@/lib/http';
import { can, type Action } from './policies';
import type { Actor } from './session';

/** Re-checks an action inside a service (defence in depth when a service is reused). */
export function requireCan(actor: Actor, action: Action): void {
  if (!can(actor.role, action)) throw forbidden();
}
