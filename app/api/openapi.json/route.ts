import { openApiDocument } from '@/lib/api/document';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET — the OpenAPI 3.1 document, public: the contract reveals no co-op's data. */
export const GET = handler(async () => openApiDocument());
