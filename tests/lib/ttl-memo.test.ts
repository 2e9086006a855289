import { describe, expect, it } from 'vitest';
import { ttlMemo } from '@/lib/cache/ttl-memo';

describe('ttlMemo (the overview chart cache)', () => {
  it('reuses a value within the TTL and loads again after it', async () => {
    let t = 0;
    let loads = 0;
    const cached = ttlMemo(60_000, 10, () => t);
    const load = async () => ++loads;
    expect(await cached('a', load)).toBe(1);
    t = 59_999;
    expect(await cached('a', load)).toBe(1);
    t = 60_000;
    expect(await cached('a', load)).toBe(2);
    expect(await cached('b', load)).toBe(3);
  });

  it('forgets a failed load so the next call tries again', async () => {
    const cached = ttlMemo(60_000, 10, () => 0);
    await expect(cached('x', () => Promise.reject(new Error('db down')))).rejects.toThrow('db down');
    await new Promise((r) => setTimeout(r, 0));
    expect(await cached('x', async () => 'ok')).toBe('ok');
  });

  it('keeps at most maxKeys keys, dropping the oldest', async () => {
    let loads = 0;
    const cached = ttlMemo(60_000, 2, () => 0);
    const load = async () => ++loads;
    await cached('a', load);
    await cached('b', load);
    await cached('c', load); // 'a' goes
    expect(await cached('b', load)).toBe(2);
    expect(await cached('a', load)).toBe(4);
  });

  it('a TTL of 0 always loads', async () => {
    let loads = 0;
    const cached = ttlMemo(0);
    await cached('a', async () => ++loads);
    await cached('a', async () => ++loads);
    expect(loads).toBe(2);
  });
});
