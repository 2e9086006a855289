/**
 * A small per-process memo for slow, read-only aggregates: the promise for a key is reused for
 * ttlMs, a failed load is forgotten at once, and the oldest key goes when maxKeys is passed.
 * A speed-up only — callers must be fine with figures up to ttlMs old. ttlMs ≤ 0 disables it.
 */
export function ttlMemo(ttlMs: number, maxKeys = 5_000, now: () => number = Date.now) {
  const memo = new Map<string, { at: number; value: Promise<unknown> }>();
  return function cached<T>(key: string, load: () => Promise<T>): Promise<T> {
    if (ttlMs <= 0) return load();
    const hit = memo.get(key);
    if (hit && now() - hit.at < ttlMs) return hit.value as Promise<T>;
    const value = load();
    memo.delete(key);
    memo.set(key, { at: now(), value });
    value.catch(() => {
      if (memo.get(key)?.value === value) memo.delete(key);
    });
    if (memo.size > maxKeys) memo.delete(memo.keys().next().value!);
    return value;
  };
}
