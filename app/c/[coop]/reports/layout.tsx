import { sectionGuard } from '@/lib/auth';

// Only roles that may 'reports:read' see this section: refused here, before anything streams (403).
export default sectionGuard('reports:read');
