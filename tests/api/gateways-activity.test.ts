/**
 * The gateway list tells when each gateway was last seen and how many captures it posted in
 * the last hour (its recent post rate), from real posts to the ingest endpoint.
 */
import { describe, expect, it } from 'vitest';
import { testServerForFile } from '../support/api-suite.ts';
import { captureVelocities } from '../support/alert-captures.ts';

const srv = testServerForFile();

describe('gateway activity', () => {
  it('counts the posts of the last hour per gateway and sets last seen', async () => {
    const admin = await srv.signIn('admin');
    const created = await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: 1, name: 'gw-busy' },
    });
    const { id, apiKey } = await created.json();
    const quiet = await (
      await srv.call('POST', '/api/v1/gateways', {
        cookie: admin,
        body: { siteId: 1, name: 'gw-quiet' },
      })
    ).json();
    // Three captures taken hours ago but received now: the rate counts receipts.
    await captureVelocities(srv, apiKey, 'MFP-P101-MDE-H', [1.5, 1.6, 1.7]);
    const list = await (await srv.call('GET', '/api/v1/gateways', { cookie: admin })).json();
    type G = { id: number; postsLastHour: number; lastSeenAt: string | null };
    const busy = (list.items as G[]).find((g) => g.id === id)!;
    expect(busy.postsLastHour).toBe(3);
    expect(Date.now() - Date.parse(busy.lastSeenAt!)).toBeLessThan(10 * 60_000);
    const idle = (list.items as G[]).find((g) => g.id === quiet.id)!;
    expect(idle).toMatchObject({ postsLastHour: 0, lastSeenAt: null });
  });
});
