import Link from 'next/link';

/** Tabs between chemical lots and oil lots. */
export function SuppliesNav({ base, current }: { base: string; current: 'chemicals' | 'oil' }) {
  const tab = (href: string, label: string, active: boolean) => (
    <Link
      href={href}
      aria-current={active ? 'page' : undefined}
      className={`inline-block border-b-4 px-3 py-2 text-sm font-semibold no-underline ${active ? 'border-amber-500 text-fir-900' : 'border-transparent text-stone-700 hover:text-fir-900'}`}
    >
      {label}
    </Link>
  );
  return (
    <nav aria-label="Supplies" className="flex gap-2 border-b border-stone-200">
      {tab(`${base}/supplies`, 'Chemicals', current === 'chemicals')}
      {tab(`${base}/supplies/oil`, 'Oil lots', current === 'oil')}
    </nav>
  );
}
