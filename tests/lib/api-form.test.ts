// The one form path (components/forms/use-api-form): a body is checked with the route's own
// schema (named from lib/validation/forms, loaded on demand) before any request, and the reasons
// are keyed by field as the server's 422 would be.
import { describe, expect, it, vi } from 'vitest';
import { callApi, checkBody, numberOf } from '@/components/forms/use-api-form';

const answer = (status: number, body: unknown) => ({
  data: status < 400 ? body : undefined,
  error: status >= 400 ? body : undefined,
  response: new Response(null, { status }),
});

describe('checkBody', () => {
  it("names each field with the route schema's own reasons", async () => {
    const fields = await checkBody('transferCreateSchema', { fromTankId: '3', toTankId: '3', quantity: '1.2345' });
    expect(fields).toEqual({ quantity: ['Use at most 3 decimals.'] });
    expect(await checkBody('transferCreateSchema', { fromTankId: '3', toTankId: '3', quantity: '5' })).toEqual({
      toTankId: ['Choose two different tanks.'],
    });
  });
  it('reports a field the schema does not accept under its own name', async () => {
    expect(
      await checkBody('transferCreateSchema', { fromTankId: '1', toTankId: '2', quantity: '5', coopId: 9 }),
    ).toEqual({ coopId: ['This field is not accepted here.'] });
  });
  it('passes a body the route would accept', async () => {
    expect(await checkBody('transferCreateSchema', { fromTankId: '1', toTankId: '2', quantity: '5' })).toBeNull();
  });
});

describe('callApi', () => {
  it('sends nothing when the check fails, and answers as a 422 would', async () => {
    const call = vi.fn();
    const r = await callApi(call, {
      schema: 'transferCreateSchema',
      body: { fromTankId: '1', toTankId: '2', quantity: '' },
    });
    expect(call).not.toHaveBeenCalled();
    expect(r).toMatchObject({ ok: false, status: 422, fields: { quantity: ['Enter a quantity.'] } });
  });
  it('sends the body as typed when the check passes', async () => {
    const body = { fromTankId: '1', toTankId: '2', quantity: '5' };
    const call = vi.fn(async (b: typeof body) => answer(201, { sent: b }));
    const r = await callApi(call, { schema: 'transferCreateSchema', body });
    expect(call).toHaveBeenCalledWith(body);
    expect(r).toEqual({ ok: true, data: { sent: body } });
  });
  it("keeps the server's field errors and sentence", async () => {
    const r = await callApi(async () =>
      answer(409, { error: 'Not enough fuel.', fields: { quantity: ['Only 4 L available.'] } }),
    );
    expect(r).toMatchObject({
      ok: false,
      status: 409,
      error: 'Not enough fuel.',
      fields: { quantity: ['Only 4 L available.'] },
    });
  });
  it('says the service could not be reached when the call throws', async () => {
    const r = await callApi(async () => {
      throw new TypeError('fetch failed');
    });
    expect(r).toMatchObject({ ok: false, status: 0 });
  });
});

describe('numberOf', () => {
  it('leaves an empty input out and lets the schema name text that is not a number', async () => {
    expect(numberOf('')).toBeUndefined();
    expect(numberOf(' 12.5 ')).toBe(12.5);
    expect(await checkBody('coopSettingsUpdateSchema', { methanolPct: numberOf('abc') })).toMatchObject({
      methanolPct: ['A number.'],
    });
  });
});
