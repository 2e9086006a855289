import Link from 'next/link';
import { Logo } from '@/components/ui/logo';
import { getSessionUser, listMyCoops } from '@/lib/auth';

export const dynamic = 'force-dynamic';

const JOBS = [
  {
    title: 'Brew with a record',
    text: 'Oil lots, titration, catalyst and methanol worked out for you, temperatures, settling, washing, quality checks and the gallons that reached the tank.',
  },
  {
    title: 'Know the cost of every gallon',
    text: 'Chemical lots used first-in first-out, energy, feedstock and other inputs give each batch its cost per gallon and the tank its running cost.',
  },
  {
    title: 'Share the tank fairly',
    text: 'Members reserve what is really available, draws are metered and priced by the co-op’s own policy, and nobody can oversell the tank.',
  },
  {
    title: 'Bill, collect and close',
    text: 'Monthly invoices by e-mail, card or cash payments, reconciliation and a month close that never loses or double-counts a payment.',
  },
];

export default async function LandingPage() {
  const user = await getSessionUser();
  const coops = user ? await listMyCoops(user.id) : [];
  return (
    <div className="min-h-screen">
      <header className="bg-fir-800 text-white">
        <div className="mx-auto flex max-w-5xl items-center justify-between px-4 py-3">
          <Logo className="text-xl" />
          {user ? (
            <Link
              className="rounded-lg bg-amber-400 px-4 py-2 font-semibold text-fir-900 no-underline"
              href={coops[0] ? `/c/${coops[0].slug}` : '/coops'}
            >
              Open my co-op
            </Link>
          ) : (
            <Link className="rounded-lg bg-amber-400 px-4 py-2 font-semibold text-fir-900 no-underline" href="/sign-in">
              Sign in
            </Link>
          )}
        </div>
      </header>
      <main className="mx-auto max-w-5xl px-4 py-10">
        <section className="max-w-3xl">
          <h1 className="text-3xl sm:text-4xl">The shared logbook, tank and till of a biodiesel co-op</h1>
          <p className="mt-4 text-lg text-stone-700">
            Tallyvat is for community co-ops that turn used cooking oil into biodiesel and share the fuel among their
            members. Brewers keep a complete record of every batch, members reserve and draw fuel from the co-op’s tank
            at a price that covers its cost, and the treasurer bills, collects and closes each month — each co-op in its
            own private space.
          </p>
        </section>
        <ul className="mt-10 grid gap-4 sm:grid-cols-2">
          {JOBS.map((j) => (
            <li key={j.title} className="rounded-xl border border-stone-200 bg-white p-5 shadow-sm">
              <h2>{j.title}</h2>
              <p className="mt-2 text-stone-700">{j.text}</p>
            </li>
          ))}
        </ul>
        <p className="mt-10 max-w-3xl text-sm text-stone-600">
          Making biodiesel involves methanol (toxic, highly flammable) and lye (caustic). Tallyvat keeps records and
          flags figures outside the usual range; it does not make any step safe. Follow your local fire codes,
          chemical-storage rules and licensed practice.
        </p>
      </main>
    </div>
  );
}
