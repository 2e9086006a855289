export { authOptions } from './options';
export {
  getSessionUser,
  touchCurrentSession,
  requireUser,
  requireMember,
  findActor,
  listMyCoops,
  type Actor,
  type SessionUser,
} from './session';
export { can, POLICY, type Action } from './policies';
export { pageMember, requirePageActor, sectionGuard } from './page';
