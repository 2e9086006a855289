import { Card } from '@/components/ui/notice';
import type { BatchDto } from '@/lib/brewing';
import { UploadForm } from '@/components/forms/upload-form';

/** The batch's attached photos, lab reports and disposal receipts, and the form to attach more. */
export function BatchFiles({ files, coop, batchId }: { files: BatchDto['files']; coop: string; batchId: number }) {
  return (
    <Card title="Photos and lab reports">
      {files.length ? (
        <ul className="mb-3 text-sm">
          {files.map((f) => (
            <li key={f.id} className="border-b border-stone-100 py-1">
              <a className="underline" href={`/api/coops/${coop}/batches/${batchId}/files/${f.id}`}>
                {f.name}
              </a>{' '}
              <span className="text-stone-600">
                — {f.purpose === 'photo' ? 'photo' : f.purpose === 'receipt' ? 'disposal receipt' : 'lab report'},{' '}
                {Math.max(1, Math.round(f.sizeBytes / 1024))} KB
              </span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="mb-3 text-sm text-stone-600">Nothing attached yet.</p>
      )}
      <UploadForm
        target={{ to: 'batch-files', coop, batchId }}
        accept="application/pdf,image/jpeg,image/png"
        label="PDF, JPEG or PNG"
        purposes={[
          { value: 'lab-report', label: 'Lab report' },
          { value: 'photo', label: 'Photo' },
        ]}
      />
    </Card>
  );
}
