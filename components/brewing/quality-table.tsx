import {
  formatQualityLimit,
  formatQualityValue,
  type QualityEvaluation,
  type QuickTestEvaluation,
} from '@/lib/quality';
import type { UnitSystem } from '@/lib/units';
import { QualityBadge, VerdictBadge } from './badges';

/** Lab results against the named standard, then the screening tests, with the caution. */
export function QualityTables({
  quality,
  screening,
  showUntested = false,
  units = 'metric',
}: {
  quality: QualityEvaluation;
  screening: QuickTestEvaluation;
  showUntested?: boolean;
  units?: UnitSystem;
}) {
  const rows = showUntested ? quality.rows : quality.rows.filter((r) => r.verdict !== 'not tested');
  return (
    <div className="flex flex-col gap-4">
      <div>
        <h3 className="mb-2 flex flex-wrap items-center gap-2 font-semibold text-fir-900">
          Lab results against {quality.standard}
          <QualityBadge text={quality.verdict.text} kind={quality.verdict.kind} />
        </h3>
        {rows.length ? (
          <div className="overflow-x-auto rounded-lg border border-stone-200">
            <table className="w-full min-w-[30rem] text-left text-sm">
              <caption className="sr-only">Lab results against {quality.standard}</caption>
              <thead className="bg-stone-100 text-xs uppercase tracking-wide text-stone-700">
                <tr>
                  <th scope="col" className="px-3 py-2">
                    Property
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Limit
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Result
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Tested by
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Verdict
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={r.property} className="border-t border-stone-100">
                    <th scope="row" className="px-3 py-1.5 font-medium">
                      {r.label}
                    </th>
                    <td className="px-3 py-1.5">{formatQualityLimit(r, units)}</td>
                    <td className="px-3 py-1.5">{formatQualityValue(r, units)}</td>
                    <td className="px-3 py-1.5 text-xs">
                      {r.laboratory
                        ? `${r.laboratory}${r.method ? `, ${r.method}` : ''}${r.date ? `, ${r.date}` : ''}`
                        : r.value === null
                          ? '—'
                          : 'Not recorded (screening only)'}
                    </td>
                    <td className="px-3 py-1.5">
                      <VerdictBadge verdict={r.verdict} />
                      {r.note ? <span className="ml-1 text-xs text-stone-600">{r.note}</span> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : (
          <p className="text-sm text-stone-600">No lab results recorded.</p>
        )}
        {quality.untestedCount > 0 ? (
          <p className="mt-1 text-xs text-stone-600">
            {quality.untestedCount} of {quality.verdict.requiredCount} required properties have no laboratory result:
            the batch does not meet {quality.standard} until every one does.
          </p>
        ) : null}
      </div>
      <div>
        <h3 className="mb-2 flex flex-wrap items-center gap-2 font-semibold text-fir-900">
          Home quick tests{' '}
          <VerdictBadge verdict={screening.overall === 'incomplete' ? 'not tested' : screening.overall} />
        </h3>
        <ul className="flex flex-col gap-1 text-sm">
          {screening.items.map((i) => (
            <li key={i.test} className="flex flex-wrap items-baseline gap-2">
              <span className="font-medium">{i.label}</span> <VerdictBadge verdict={i.status} />{' '}
              <span className="text-stone-700">{i.detail}</span>
            </li>
          ))}
        </ul>
      </div>
      <p className="rounded-lg bg-stone-100 p-2 text-xs text-stone-700">{quality.caution}</p>
    </div>
  );
}
