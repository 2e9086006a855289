import 'server-only';
// Moved to lib/db.ts; this re-export goes once every caller imports from there.
export { inTransaction, sqlState } from '@/lib/db';
