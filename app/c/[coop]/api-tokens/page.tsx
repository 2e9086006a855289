import type { Metadata } from 'next';
import { ApiTokens } from '@/components/settings/api-tokens';
import { requirePageActor } from '@/lib/auth';

export const metadata: Metadata = { title: 'API tokens' };

export default async function ApiTokensPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  await requirePageActor(coop, 'tokens:manage');
  return (
    <div className="flex max-w-3xl flex-col gap-5">
      <div>
        <h1>API tokens</h1>
        <p className="text-stone-600">
          Personal access tokens let your own tools (a pump meter logger, a spreadsheet, an accounting import) use the{' '}
          <a href="/docs/api" className="font-semibold text-fir-700 underline">
            Tallyvat API
          </a>{' '}
          for this co-op only. A token acts with the role of the person who created it; a read-only token can only read.
          Changes made with a token are in the audit log under its creator and the token.
        </p>
      </div>
      <ApiTokens coop={coop} />
    </div>
  );
}
