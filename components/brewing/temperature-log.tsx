'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { numberOf, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { batchPath } from './batch-path';
import { formatTime, formatWhen } from '@/lib/dates';
import { temperatureCheck, type TemperatureLevel } from '@/lib/chemistry';
import { formatTemp, tempLabel, tempToC, type UnitSystem } from '@/lib/units';
import { SubmitButton } from '@/components/forms/submit-button';

export interface Reading {
  id: string;
  measuredAt: string;
  tempC: number;
  level: TemperatureLevel;
  message: string;
}

const LEVEL_TONE: Record<TemperatureLevel, 'ok' | 'warn' | 'danger' | 'info'> = {
  ok: 'ok',
  cold: 'info',
  warning: 'warn',
  danger: 'danger',
};
const LEVEL_TEXT: Record<TemperatureLevel, string> = {
  ok: 'In range',
  cold: 'Cold',
  warning: 'Warning',
  danger: 'Danger',
};

/**
 * Reaction temperature readings. The check (lib/chemistry temperatureCheck) shows while a
 * reading is typed and again as saved; it never calls a reading safe.
 */
export function TemperatureLog({
  url,
  readings,
  units,
  timeZone,
  readOnly,
  elevationM = 0,
}: {
  url: string;
  readings: Reading[];
  units: UnitSystem;
  timeZone: string;
  readOnly?: boolean;
  elevationM?: number;
}) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  const [typed, setTyped] = useState('');
  const typedNumber = typed.trim() === '' ? NaN : Number(typed);
  const preview = Number.isFinite(typedNumber)
    ? temperatureCheck(tempToC(typedNumber, units), units, { elevationM })
    : null;

  async function onSubmit(e: React.FormEvent) {
    e.preventDefault();
    const body = { temp: numberOf(typed) as number };
    const saved = await send(
      (b) =>
        apiClient.POST('/api/coops/{coop}/batches/{id}/temperatures', { params: { path: batchPath(url) }, body: b }),
      { schema: 'temperatureCreateSchema', body },
    );
    if (saved) {
      setTyped('');
      router.refresh();
    }
  }

  return (
    <div className="flex flex-col gap-3">
      {readings.length ? (
        <ol className="flex flex-col gap-1 text-sm" aria-label="Temperature readings">
          {readings.map((r) => (
            <li key={r.id} className="flex flex-wrap items-baseline gap-2 border-b border-stone-100 py-1">
              <time className="w-28 text-stone-600" dateTime={r.measuredAt} title={formatWhen(r.measuredAt, timeZone)}>
                {formatTime(r.measuredAt, timeZone)}
              </time>
              <span className="w-20 font-semibold">{formatTemp(r.tempC, units, 1)}</span>
              <span
                className={`rounded px-1.5 text-xs font-semibold ${r.level === 'ok' ? 'bg-ok-50 text-ok-700' : r.level === 'danger' ? 'bg-danger-50 text-danger-700' : r.level === 'warning' ? 'bg-warn-50 text-warn-700' : 'bg-fir-50 text-fir-900'}`}
              >
                {LEVEL_TEXT[r.level]}
              </span>
              {r.level !== 'ok' ? <span className="basis-full text-stone-700 sm:basis-auto">{r.message}</span> : null}
            </li>
          ))}
        </ol>
      ) : (
        <p className="text-sm text-stone-600">
          No readings yet. The usual reaction range is {units === 'us' ? '130–135 °F' : '54–57 °C'}.
        </p>
      )}
      {readOnly ? null : (
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-2">
          <div className="flex flex-wrap items-end gap-2">
            <TextField
              label={`Reading (${tempLabel(units)})`}
              name="temp"
              inputMode="decimal"
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
              errors={fields.temp}
              autoComplete="off"
            />
            <SubmitButton disabled={busy}>{busy ? 'Adding…' : 'Add reading'}</SubmitButton>
          </div>
          {preview ? <Notice tone={LEVEL_TONE[preview.level]}>{preview.message}</Notice> : null}
          {message?.tone === 'danger' && !fields.temp ? <Notice tone="danger">{message.text}</Notice> : null}
        </form>
      )}
    </div>
  );
}
