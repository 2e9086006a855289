import { sectionGuard } from '@/lib/auth';

// Only roles that may 'audit:read' see this section: refused here, before anything streams (403).
export default sectionGuard('audit:read');
