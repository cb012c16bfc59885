import { afterEach, describe, expect, it, vi } from 'vitest';
import { createLogger } from './logger.ts';
import { OUTAGE_QUIET_MS, errorReply } from './error-middleware.ts';

afterEach(() => {
  vi.useRealTimers();
});

describe('a database outage in the log', () => {
  it('is one line however many requests get 503, and a later outage is a new line', () => {
    // common practice, no source: log the state change, not every request it affects.
    vi.useFakeTimers();
    const lines: string[] = [];
    const log = createLogger('warn', (l) => lines.push(l));
    const away = Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' });
    for (let i = 0; i < 1000; i++) {
      expect(errorReply(away, log, { path: '/api/v1/fleet' }).status).toBe(503);
      vi.advanceTimersByTime(10);
    }
    expect(lines.length).toBe(1);
    vi.advanceTimersByTime(OUTAGE_QUIET_MS + 1);
    errorReply(away, log, { path: '/api/v1/fleet' });
    expect(lines.length).toBe(2);
  });
});
