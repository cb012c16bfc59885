import { describe, expect, it } from 'vitest';
import { isLoopbackUrl, parseSimArgs, UsageError } from './cli-args.ts';
import { backoffMs, retryAfterMs } from './ingest-client.ts';
import { captureUid } from '@turnstone/demo-scenario/simulated-snapshot';

describe('parseSimArgs', () => {
  it('reads every option and fills the defaults', () => {
    const o = parseSimArgs([
      '--url',
      'http://127.0.0.1:8080/',
      '--key',
      'k',
      '--count',
      '3',
      '--faults',
      '--rate-per-s=20',
    ]);
    expect(o).toMatchObject({
      url: 'http://127.0.0.1:8080',
      key: 'k',
      site: 'MFP',
      intervalS: 60,
      count: 3,
      batch: 10,
      ratePerS: 20,
      faults: true,
    });
  });

  it('without --url posts to the product on this machine: 127.0.0.1 on PORT, else 8080', () => {
    // README: `npm run sim -- --key <key>` works as written.
    expect(parseSimArgs(['--key', 'k']).url).toBe('http://127.0.0.1:8080');
    expect(parseSimArgs(['--key', 'k'], { PORT: '9090' }).url).toBe('http://127.0.0.1:9090');
    expect(parseSimArgs(['--key', 'k'], { PORT: '0' }).url).toBe('http://127.0.0.1:8080');
    expect(() => parseSimArgs([])).toThrow(/--key is required/);
  });

  it('refuses a remote URL unless --allow-remote', () => {
    expect(() => parseSimArgs(['--url', 'http://example.com', '--key', 'k'])).toThrow(UsageError);
    expect(parseSimArgs(['--url', 'http://example.com', '--key', 'k', '--allow-remote']).url).toBe(
      'http://example.com',
    );
  });

  it('treats localhost, 127.0.0.0/8 and ::1 as loopback, and nothing else', () => {
    for (const u of [
      'http://localhost:1',
      'http://127.0.0.1',
      'http://127.1.2.3:9',
      'http://[::1]:8080',
    ])
      expect(isLoopbackUrl(new URL(u))).toBe(true);
    for (const u of [
      'http://10.0.0.1',
      'http://127.0.0.1.example.com',
      'http://localhost.example.com',
    ])
      expect(isLoopbackUrl(new URL(u))).toBe(false);
  });

  it('rejects a batch above the API limit and unknown options', () => {
    expect(() =>
      parseSimArgs(['--url', 'http://127.0.0.1', '--key', 'k', '--batch', '101']),
    ).toThrow(/at most 100/);
    expect(() => parseSimArgs(['--url', 'http://127.0.0.1', '--key', 'k', '--bogus'])).toThrow(
      /unknown option/,
    );
  });
});

describe('retry timing', () => {
  it('reads Retry-After as seconds or as an HTTP date', () => {
    // RFC 9110 §10.2.3: delay-seconds or an HTTP-date.
    expect(retryAfterMs('10')).toBe(10_000);
    expect(retryAfterMs('Wed, 02 Dec 2026 10:00:30 GMT', Date.UTC(2026, 11, 2, 10, 0, 0))).toBe(
      30_000,
    );
    expect(retryAfterMs(null)).toBeNull();
    expect(retryAfterMs('soon')).toBeNull();
  });

  it('backs off exponentially with jitter, capped', () => {
    expect(backoffMs(0, 500, 60_000, () => 1)).toBe(500);
    expect(backoffMs(3, 500, 60_000, () => 1)).toBe(4000);
    expect(backoffMs(3, 500, 60_000, () => 0)).toBe(2000);
    expect(backoffMs(20, 500, 60_000, () => 1)).toBe(60_000);
  });
});

describe('captureUid', () => {
  it('is the tag and the capture time, valid for the ingest API', () => {
    const uid = captureUid('MFP-P101-MDE-H', new Date('2026-12-01T12:00:00.000Z'));
    expect(uid).toBe('MFP-P101-MDE-H@20261201T120000Z');
    expect(uid).toMatch(/^[A-Za-z0-9._:@-]+$/);
  });
});
