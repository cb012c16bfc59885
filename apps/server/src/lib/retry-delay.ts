/**
 * The back-off of outgoing deliveries (mail and webhooks): 30 s doubling per attempt, at most
 * an hour (common practice, no source).
 */
export const outboxRetryDelayS = (attempts: number) =>
  Math.min(3600, 30 * 2 ** Math.max(0, attempts - 1));
