import Link from 'next/link';
import { Card } from '@/components/ui/notice';
import { requireMember, can } from '@/lib/auth';
import { NAV_ITEMS } from '@/components/shell/nav-items';

export default async function OverviewPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requireMember(coop, 'coop:read');
  const links = NAV_ITEMS.filter((i) => i.href !== '' && can(actor.role, i.action));
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1>{actor.coop.name}</h1>
        <p className="text-stone-600">
          Signed in as {actor.user.name}, {actor.role}. Volumes in {actor.coop.units === 'us' ? 'US gallons, temperatures in °F' : 'litres, temperatures in °C'}.
        </p>
      </div>
      <Card title="Where to next">
        <ul className="grid gap-2 sm:grid-cols-3">
          {links.map((l) => (
            <li key={l.href}>
              <Link className="block rounded-lg border border-stone-200 px-3 py-3 font-medium no-underline hover:bg-fir-50" href={`/c/${actor.coop.slug}${l.href}`}>
                {l.label}
              </Link>
            </li>
          ))}
        </ul>
      </Card>
    </div>
  );
}
