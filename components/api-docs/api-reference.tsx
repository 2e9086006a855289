'use client';

import dynamic from 'next/dynamic';
import 'swagger-ui-react/swagger-ui.css';
import './api-reference.css';

// Swagger UI ships with the app (no CDN) and loads only on this page.
const SwaggerUI = dynamic(() => import('swagger-ui-react'), {
  ssr: false,
  loading: () => <p className="text-stone-600">Loading the reference…</p>,
});

/** The interactive reference, rendered from the served OpenAPI document. */
export function ApiReference() {
  return (
    <div className="tv-api-docs rounded-xl border border-stone-200 bg-white">
      <SwaggerUI url="/api/openapi.json" docExpansion="list" defaultModelsExpandDepth={0} tryItOutEnabled={false} />
    </div>
  );
}
