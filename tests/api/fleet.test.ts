import { describe, expect, it } from 'vitest';
import { fleetSchema } from '@turnstone/contracts/fleet';
import { testServerForFile } from '../support/api-suite.ts';

const srv = testServerForFile();

describe('fleet', () => {
  it('returns the seeded tree in the shared contract shape, with point ids and tags', async () => {
    const cookie = await srv.signIn('engineer');
    const res = await srv.call('GET', '/api/v1/fleet', { cookie });
    expect(res.status).toBe(200);
    const fleet = fleetSchema.parse(await res.json());
    const machines = fleet.items.flatMap((s) => s.areas.flatMap((a) => a.machines));
    expect(machines.length).toBeGreaterThanOrEqual(10);
    const tags = machines.flatMap((m) => m.points.map((p) => p.tag));
    expect(new Set(tags).size).toBe(tags.length);
    expect(tags).toContain('MFP-P101-MDE-H');
  });
});
