import { safetyCautionsFor, type SafetyTopic } from '@/lib/safety';

/**
 * The usual cautions for the step at hand (lib/safety), always ending with the deference to
 * local fire codes, chemical-storage rules and licensed practice. The app never calls a step safe.
 */
export function SafetyNote({
  topics,
  title = 'Safety',
  altitude,
}: {
  topics: SafetyTopic[];
  title?: string;
  altitude?: string | null;
}) {
  const items = safetyCautionsFor(topics, { altitudeText: altitude });
  return (
    <aside aria-label={title} className="rounded-lg border border-warn-600/30 bg-warn-50 p-3 text-sm text-warn-700">
      <p className="font-semibold">{title}</p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {items.map((c) => (
          <li key={c.id}>{c.text}</li>
        ))}
      </ul>
    </aside>
  );
}
