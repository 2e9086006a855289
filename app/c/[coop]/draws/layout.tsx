import { sectionGuard } from '@/lib/auth';

// Only roles that may 'draws:read-all' see this section: refused here, before anything streams (403).
export default sectionGuard('draws:read-all');
