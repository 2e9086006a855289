import type { Metadata } from 'next';
import { SettingsForm } from '@/components/settings/settings-form';
import { requirePageActor } from '@/lib/auth';
import { getCoopSettings } from '@/lib/coops/settings';

export const metadata: Metadata = { title: 'Co-op settings' };

export default async function SettingsPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const settings = await getCoopSettings(await requirePageActor(coop, 'settings:manage'));
  return (
    <div className="flex max-w-3xl flex-col gap-5">
      <div>
        <h1>Co-op settings</h1>
        <p className="text-stone-600">
          Units, time zone, dues and the planner’s recipe defaults. Every change is kept in the audit log.
        </p>
      </div>
      <SettingsForm initial={settings} />
    </div>
  );
}
