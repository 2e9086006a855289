import { sectionGuard } from '@/lib/auth';

// Only roles that may 'imports:manage' see this section: refused here, before anything streams (403).
export default sectionGuard('imports:manage');
