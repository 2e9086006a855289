/**
 * A bounded per-process memo for a pure function: the value for a key is computed once and kept
 * until maxKeys newer keys push it out (least recently used first). Only for results that depend
 * on nothing but the key, so no instance can ever hold a stale one.
 */
export function lruMemo<T>(maxKeys: number) {
  const memo = new Map<string, T>();
  return function cached(key: string, compute: () => T): T {
    const hit = memo.get(key);
    if (hit !== undefined) {
      memo.delete(key);
      memo.set(key, hit);
      return hit;
    }
    const value = compute();
    memo.set(key, value);
    if (memo.size > maxKeys) memo.delete(memo.keys().next().value!);
    return value;
  };
}
