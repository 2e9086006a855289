'use client';

import { useRouter } from 'next/navigation';

/** Switches between the co-ops the signed-in person belongs to. */
export function CoopSwitcher({ current, coops }: { current: string; coops: { slug: string; name: string }[] }) {
  const router = useRouter();
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="sr-only">Co-op</span>
      <select
        className="max-w-[11rem] truncate rounded-md border border-fir-600 bg-fir-900 px-2 py-1.5 text-white sm:max-w-xs"
        value={current}
        onChange={(e) => router.push(e.target.value === '__all' ? '/coops' : `/c/${e.target.value}`)}
      >
        {coops.map((c) => (
          <option key={c.slug} value={c.slug}>
            {c.name}
          </option>
        ))}
        <option value="__all">All my co-ops…</option>
      </select>
    </label>
  );
}
