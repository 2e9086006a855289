import { describe, expect, it } from 'vitest';
import { lruMemo } from '@/lib/cache/lru-memo';

describe('lruMemo', () => {
  it('computes a key once, and drops the least recently used key beyond its bound', () => {
    const calls: string[] = [];
    const cached = lruMemo<string>(2);
    const get = (k: string) => cached(k, () => (calls.push(k), k.toUpperCase()));
    expect([get('a'), get('b'), get('a')]).toEqual(['A', 'B', 'A']);
    expect(calls).toEqual(['a', 'b']);
    get('c'); // 'b' was used least recently: it goes, 'a' stays
    get('a');
    get('b');
    expect(calls).toEqual(['a', 'b', 'c', 'b']);
  });
});
