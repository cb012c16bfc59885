import { describe, expect, it } from 'vitest';
import { createLogger } from '../../lib/logger.ts';
import { createRejectionLog } from './rejection-log.ts';

describe('rejected gateway posts are logged at warn, rate-limited per sender and reason', () => {
  it('logs the first at once, counts the rest of the quiet period into the next line', () => {
    // common practice, no source: one line per sender and reason per minute.
    const lines: Record<string, unknown>[] = [];
    const note = createRejectionLog(
      createLogger('warn', (l) => lines.push(JSON.parse(l))),
      60_000,
    );
    const r = { status: 401, code: 'invalid_api_key', client: '10.0.0.7', path: '/x' };
    note(r, 0);
    for (let t = 1; t <= 5; t++) note(r, t * 1000);
    note({ ...r, status: 404, code: 'unknown_point', gatewayId: 3 }, 2000);
    note({ ...r, status: 400, code: 'validation_failed' }, 2000); // not a rejection of the sender
    expect(lines).toHaveLength(2);
    expect(lines[0]).toMatchObject({ level: 'warn', status: 401, client: '10.0.0.7' });
    expect(lines[1]).toMatchObject({ status: 404, gatewayId: 3 });
    note(r, 61_000);
    expect(lines).toHaveLength(3);
    expect(lines[2]).toMatchObject({ status: 401, alsoRejectedSinceLastLine: 5 });
  });
});
