import { sectionGuard } from '@/lib/auth';

// Only roles that may 'supplies:read' see this section: refused here, before anything streams (403).
export default sectionGuard('supplies:read');
