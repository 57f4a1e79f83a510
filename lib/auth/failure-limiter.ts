/**
 * Counts failures per key in a sliding window, in this process's memory. Enough for one server
 * process; the counts start again when it restarts.
 */
export interface FailureLimiter {
  /** Milliseconds until the key may try again, or 0 when it may now. */
  blockedFor(key: string, now?: number): number;
  fail(key: string, now?: number): void;
  clear(key: string): void;
}

export function createFailureLimiter({ max, windowMs }: { max: number; windowMs: number }): FailureLimiter {
  const failures = new Map<string, number[]>();
  const recent = (key: string, now: number): number[] => {
    const kept = (failures.get(key) ?? []).filter((t) => now - t < windowMs);
    if (kept.length) failures.set(key, kept);
    else failures.delete(key);
    return kept;
  };
  return {
    blockedFor(key, now = Date.now()) {
      const kept = recent(key, now);
      const oldest = kept[kept.length - max];
      return kept.length >= max && oldest !== undefined ? oldest + windowMs - now : 0;
    },
    fail(key, now = Date.now()) {
      failures.set(key, [...recent(key, now), now]);
    },
    clear(key) {
      failures.delete(key);
    },
  };
}
