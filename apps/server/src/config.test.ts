import { describe, expect, it } from 'vitest';
import { loadConfig, parseTrustProxy } from './config.ts';

/** The message loadConfig throws for `env`, or '' when it is accepted. */
const refusal = (env: Record<string, string>) => {
  try {
    loadConfig(env);
    return '';
  } catch (err) {
    return (err as Error).message;
  }
};

describe('configuration is checked before anything starts, naming each bad variable', () => {
  it('TRUST_PROXY: true/false, hops, or addresses and CIDR ranges as Express takes them', () => {
    // Express's "trust proxy" setting (expressjs.com, "Express behind proxies").
    expect(parseTrustProxy('true')).toBe(true);
    expect(parseTrustProxy('false')).toBe(false);
    expect(parseTrustProxy('2')).toBe(2);
    expect(parseTrustProxy('loopback, 10.0.0.0/8,fd00::/8')).toBe('loopback,10.0.0.0/8,fd00::/8');
    for (const bad of ['yes please', '10.0.0.0/33', '300.1.1.1', 'proxy.example', '1/2/3'])
      expect(parseTrustProxy(bad), bad).toBeNull();
    expect(refusal({ TRUST_PROXY: 'proxy.example' })).toMatch(
      /^Invalid configuration:\n {2}TRUST_PROXY: "proxy.example" is not true, false/,
    );
    expect(loadConfig({ TRUST_PROXY: '1' }).TRUST_PROXY).toBe(1);
  });

  it('DIGEST_CRON must be a cron expression, DIGEST_TIME_ZONE an IANA zone', () => {
    expect(refusal({ DIGEST_CRON: 'every monday' })).toMatch(
      /DIGEST_CRON: is not a cron expression/,
    );
    expect(refusal({ DIGEST_CRON: '0 7 * * 1' })).toBe('');
    expect(refusal({ DIGEST_TIME_ZONE: 'Mars/Olympus' })).toMatch(
      /DIGEST_TIME_ZONE: is not an IANA time zone/,
    );
    expect(refusal({ DIGEST_TIME_ZONE: 'Europe/London' })).toBe('');
  });

  it('every bad variable is listed at once, and DATABASE_URL must be mysql://', () => {
    const m = refusal({
      DATABASE_URL: 'localhost:3306',
      PORT: 'eighty',
      DIGEST_TIME_ZONE: 'Nowhere/Special',
      INGEST_TIMEOUT_S: '0',
    });
    for (const v of ['DATABASE_URL', 'PORT', 'DIGEST_TIME_ZONE', 'INGEST_TIMEOUT_S'])
      expect(m).toMatch(new RegExp(`^ {2}${v}: `, 'm'));
    expect(m).toContain('DATABASE_URL: must be a mysql:// URL');
    expect(refusal({ DATABASE_URL: 'postgres://u:p@h/db' })).toContain('mysql://');
    expect(refusal({ DATABASE_URL: 'mysql://u:p@db.example:3306/turnstone' })).toBe('');
  });
});
