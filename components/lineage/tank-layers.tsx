import Link from 'next/link';
import { vol } from '@/components/brewing/format';
import { StepForm } from '@/components/brewing/step-form';
import { Card, Notice } from '@/components/ui/notice';
import type { TankLayersDto } from '@/lib/lineage';

export const MIXING_TEXT = {
  mixed:
    'Well mixed (stirred or recirculated): every draw carries each batch in the tank in proportion to how much of it is there.',
  fifo: 'First in, first out (not stirred, drawn from the bottom): a draw takes the oldest fuel first.',
} as const;

/** A tank's fuel by batch, oldest first, with the mixing model stated (and changeable by brewers and admins). */
export function TankLayers({ data, base, canWrite }: { data: TankLayersDto; base: string; canWrite: boolean }) {
  const units = data.units;
  return (
    <Card title={`Fuel by batch: ${data.tankName}`}>
      <p className="text-sm">
        <span className="font-semibold">Mixing model:</span> {MIXING_TEXT[data.mixing]}
      </p>
      {data.held > 0 ? (
        <div className="mt-2">
          <Notice tone="danger" title="Fuel held">
            {vol(data.heldLiters, units, 2)} of this tank is held while a batch in it is under review: it cannot be
            reserved, drawn or moved.
          </Notice>
        </div>
      ) : null}
      {data.layers.length ? (
        <div className="mt-3 overflow-x-auto">
          <table className="w-full text-sm">
            <caption className="sr-only">Fuel in {data.tankName} by batch, oldest first</caption>
            <thead>
              <tr className="border-b border-stone-300 text-left">
                <th scope="col" className="py-1">
                  Batch
                </th>
                <th scope="col" className="py-1 text-right">
                  In the tank
                </th>
                <th scope="col" className="py-1 text-right">
                  Share
                </th>
                <th scope="col" className="py-1">
                  State
                </th>
              </tr>
            </thead>
            <tbody>
              {data.layers.map((l) => (
                <tr key={l.id} className="border-b border-stone-100">
                  <td className="py-1">
                    {l.batchId ? (
                      <Link href={`${base}/batches/${l.batchId}`}>Batch {l.batchNumber}</Link>
                    ) : (
                      'Unattributed (opening stock or fuel of unrecorded origin)'
                    )}
                  </td>
                  <td className="py-1 text-right">{vol(l.quantityLiters, units, 2)}</td>
                  <td className="py-1 text-right">{l.sharePct.toFixed(1)} %</td>
                  <td className="py-1">
                    {l.underReview ? <strong className="text-danger-700">Under review — held</strong> : 'Available'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="mt-2 text-sm text-stone-600">The tank is empty.</p>
      )}
      {canWrite ? (
        <details className="mt-3 rounded-lg border border-stone-200 p-3">
          <summary className="cursor-pointer font-semibold text-fir-800">Change the mixing model</summary>
          <div className="mt-3">
            <StepForm
              url={`/api${base.replace(/^\/c\//, '/coops/')}/tanks/${data.tankId}`}
              submitLabel="Save mixing model"
              okText="Mixing model saved."
              fields={[
                {
                  name: 'mixing',
                  label: 'How this tank behaves',
                  kind: 'select',
                  defaultValue: data.mixing,
                  options: [
                    { value: 'mixed', label: 'Well mixed' },
                    { value: 'fifo', label: 'First in, first out' },
                  ],
                  hint: 'Applies to draws from now on; past draws keep the batches they carried.',
                },
              ]}
            />
          </div>
        </details>
      ) : null}
    </Card>
  );
}
