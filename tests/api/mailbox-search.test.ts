/**
 * The admin's mailbox searches recipient and subject (through the real outbox sender and the
 * local SMTP fake) and answers subjects whole.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { testServerForFile } from '../support/api-suite.ts';
import { queueMail } from '../support/mail-inbox.ts';

const srv = testServerForFile();
const LONG =
  '[Turnstone] Escalated to danger: Intake pump P-101 MFP-P101-MDE-H — Bearing outer race (BPFO), envelope 0.62 g';
beforeAll(async () => {
  for (const [to, subject] of [
    ['night.shift@plant.test', LONG],
    ['planner@plant.test', '[Turnstone] Weekly review: 3 machines need a look'],
    ['100%_sure@plant.test', 'Percent test'],
  ] as const)
    await queueMail(srv, { dedupeKey: `search:${to}`, to, subject });
  await srv.mail.sender.drain();
});

const search = async (q: string) => {
  const cookie = await srv.signIn('admin');
  const res = await srv.call('GET', `/api/v1/mailbox?search=${encodeURIComponent(q)}`, { cookie });
  expect(res.status).toBe(200);
  return (await res.json()).items as { to: string; subject: string }[];
};

describe('mailbox search', () => {
  it('finds by part of the recipient or of the subject, with the whole subject', async () => {
    expect((await search('night.shift')).map((m) => m.subject)).toEqual([LONG]);
    expect((await search('BPFO')).map((m) => m.to)).toEqual(['night.shift@plant.test']);
    expect((await search('weekly review')).map((m) => m.to)).toEqual(['planner@plant.test']);
    expect(await search('no such thing')).toEqual([]);
  });

  it('takes % and _ literally', async () => {
    expect((await search('100%_')).map((m) => m.to)).toEqual(['100%_sure@plant.test']);
    expect(await search('%')).toHaveLength(1);
  });
});
