import { sectionGuard } from '@/lib/auth';

// Only roles that may 'batches:write' see this section: refused here, before anything streams (403).
export default sectionGuard('batches:write');
