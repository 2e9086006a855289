import { sectionGuard } from '@/lib/auth';

// Only roles that may 'settings:manage' see this section: refused here, before anything streams (403).
export default sectionGuard('settings:manage');
