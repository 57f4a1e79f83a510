/**
 * Retry schedule of the outbox: exponential backoff, delay = base · 2^(attempt − 1), capped.
 * With the defaults (30 s base, 1 h cap, 10 attempts) a message is tried for about 5 hours
 * before it is marked failed.
 */
export interface RetryPolicy {
  maxAttempts: number;
  baseDelayMs: number;
  maxDelayMs: number;
}

export const defaultRetryPolicy: RetryPolicy = { maxAttempts: 10, baseDelayMs: 30_000, maxDelayMs: 3_600_000 };

/** When to try again after `attempts` failed attempts, or null when the message has used them all. */
export function nextAttemptAt(now: Date, attempts: number, policy: RetryPolicy): Date | null {
  if (attempts >= policy.maxAttempts) return null;
  const delay = Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** Math.max(0, attempts - 1));
  return new Date(now.getTime() + delay);
}
