import type { Metadata } from 'next';
import { ApiReference } from '@/components/api-docs/api-reference';

export const metadata: Metadata = { title: 'API reference' };

/** The API reference, public like the document it renders (GET /api/openapi.json). */
export default function ApiDocsPage() {
  return (
    <main className="mx-auto flex max-w-6xl flex-col gap-4 px-4 py-8">
      <div className="flex flex-col gap-2">
        <h1>Tallyvat API</h1>
        <p className="text-stone-700">
          Everything the app does is available to your own tools through this API. Sign in to try calls from this page
          with your session, or create a <strong>personal access token</strong> (<em>API tokens</em> in your co-op,
          admins and treasurers) and send it as <code>Authorization: Bearer …</code>. The machine-readable contract is{' '}
          <a className="font-semibold text-fir-700 underline" href="/api/openapi.json">
            /api/openapi.json
          </a>{' '}
          (OpenAPI 3.1).
        </p>
      </div>
      <ApiReference />
    </main>
  );
}
