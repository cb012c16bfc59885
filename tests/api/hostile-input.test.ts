/**
 * Hostile and broken input against the real server: a generated corpus of bad requests.
 * Every one must get a 4xx with `{ error: { code, message } }`, the server must stay up, and
 * nothing may be stored. (OWASP ASVS 5.0: input validation, 1.x/2.x; file handling 5.x.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import jwt from 'jsonwebtoken';
import { startTestServer, type TestServer } from '../support/test-server.ts';
import { snapshotBody } from '../support/signals.ts';

let srv: TestServer;
let key: string;
let revokedKey: string;
let admin: string;
const TAG = 'MFP-P101-MDE-H';

async function stored(): Promise<number[]> {
  const out: number[] = [];
  for (const t of ['snapshots', 'jobs', 'analyses', 'gateways', 'users', 'audit_log']) {
    const [rows] = await srv.ctx.dbHandle.pool.query(`SELECT COUNT(*) AS n FROM ${t}`);
    out.push(Number((rows as { n: number }[])[0]!.n));
  }
  return out;
}

interface BadRequest {
  name: string;
  method: string;
  path: string;
  headers?: Record<string, string>;
  raw?: string | FormData;
  body?: unknown;
  auth?: 'gateway' | 'revoked' | 'admin' | 'none';
}

const good = () => snapshotBody(TAG, `good-${Math.random().toString(36).slice(2)}`);
const SQL_AND_SCRIPT = [
  "' OR '1'='1",
  "'; DROP TABLE snapshots; --",
  '" OR ""="',
  '1; SELECT SLEEP(5)',
  '<script>alert(1)</script>',
  '"><img src=x onerror=alert(1)>',
  '../../../../etc/passwd',
  '${7*7}{{7*7}}',
  '\u0000null-byte',
  'a'.repeat(5000),
];

function corpus(): BadRequest[] {
  const list: BadRequest[] = [];
  const ingest = (name: string, x: Partial<BadRequest>): BadRequest => ({
    name: `ingest: ${name}`,
    method: 'POST',
    path: '/api/ingest/v1/snapshots',
    auth: 'gateway',
    ...x,
  });
  // Malformed JSON.
  for (const raw of [
    '{',
    '{"uid":',
    '[',
    'null',
    'true',
    '"just a string"',
    '{"a":1,}',
    "{'uid':'x'}",
    '{"uid":"x"} trailing',
    'NaN',
    '{"samples":[1,2,NaN]}',
    '{"samples":[Infinity]}',
    '\u0000\u0001',
    '<?xml version="1.0"?><a/>',
    '{"uid":"x",,}',
  ])
    list.push(
      ingest(`malformed ${JSON.stringify(raw).slice(0, 30)}`, {
        raw,
        headers: { 'content-type': 'application/json' },
      }),
    );
  // Deeply nested JSON.
  for (const depth of [100, 5_000, 50_000])
    list.push(
      ingest(`nested ${depth}`, {
        raw: '['.repeat(depth) + ']'.repeat(depth),
        headers: { 'content-type': 'application/json' },
      }),
    );
  list.push(
    ingest('nested objects', {
      raw: '{"a":'.repeat(20_000) + '1' + '}'.repeat(20_000),
      headers: { 'content-type': 'application/json' },
    }),
  );
  // Wrong content type.
  list.push(
    ingest('text/plain body', {
      raw: JSON.stringify(good()),
      headers: { 'content-type': 'text/plain' },
    }),
  );
  list.push(
    ingest('form body', {
      raw: 'uid=x&pointTag=y',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
    }),
  );
  // Wrong types, field by field.
  const wrong: Record<string, unknown[]> = {
    uid: [null, 1, {}, [], '', 'has space', 'x'.repeat(129)],
    pointTag: [null, 7, {}, '', 'x'.repeat(65)],
    takenAt: [
      null,
      0,
      'yesterday',
      '2026-13-40T00:00:00Z',
      '2099-01-01T00:00:00Z',
      '1970-01-01T00:00:00Z',
      '2026-11-01T00:00:00',
    ],
    sampleRateHz: [null, '10240', -1, 0, 1e12, 99],
    encoding: [null, 'int8', 'INT16', 16, 'float64'],
    samples: [
      null,
      123,
      {},
      [],
      [1, 2, 3],
      'not base64 !!!',
      ['1', '2'],
      [1.5, 2.5, ...Array(300).fill(0)],
      Array(300).fill(40000),
    ],
    sampleCount: [-1, 1.5, '4096', 4095],
    adc: [
      null,
      16,
      { bits: 4, fullScaleV: 5 },
      { bits: 40, fullScaleV: 5 },
      { bits: 16, fullScaleV: -5 },
      { bits: 24, fullScaleV: 5 },
      { bits: 16 },
    ],
    sensor: [
      null,
      100,
      { sensitivityMvPerG: 0 },
      { sensitivityMvPerG: -100 },
      { sensitivityMvPerG: '100' },
    ],
    speedRpm: [0, -1480, '1480', 1e9],
    tach: [
      null,
      { pulseTimesS: [0.1], pulsesPerRev: 1 },
      { pulseTimesS: [0.2, 0.1], pulsesPerRev: 1 },
      { pulseTimesS: [0, 0.04], pulsesPerRev: 0 },
    ],
  };
  for (const [field, values] of Object.entries(wrong))
    for (const v of values)
      list.push(
        ingest(`${field} = ${JSON.stringify(v)?.slice(0, 40)}`, {
          body: { ...good(), [field]: v },
        }),
      );
  // Missing fields.
  for (const field of [
    'uid',
    'pointTag',
    'takenAt',
    'sampleRateHz',
    'encoding',
    'samples',
    'adc',
    'sensor',
  ]) {
    const b: Record<string, unknown> = good();
    delete b[field];
    list.push(ingest(`missing ${field}`, { body: b }));
  }
  // Infinity sneaks in through JSON as 1e999; NaN as a float32 pattern in base64.
  list.push(
    ingest('1e999 sample rate', {
      raw: JSON.stringify(good()).replace(/"sampleRateHz":\d+/, '"sampleRateHz":1e999'),
      headers: { 'content-type': 'application/json' },
    }),
  );
  const nanBytes = Buffer.alloc(4 * 512);
  for (let i = 0; i < 512; i++) nanBytes.writeFloatLE(i === 7 ? Number.NaN : 0.1, i * 4);
  list.push(
    ingest('float32 NaN in base64', {
      body: {
        ...good(),
        encoding: 'float32',
        adc: { bits: 24, fullScaleV: 5 },
        samples: nanBytes.toString('base64'),
      },
    }),
  );
  const infBytes = Buffer.alloc(4 * 512);
  infBytes.writeFloatLE(Number.POSITIVE_INFINITY, 40);
  list.push(
    ingest('float32 Infinity in base64', {
      body: {
        ...good(),
        encoding: 'float32',
        adc: { bits: 24, fullScaleV: 5 },
        samples: infBytes.toString('base64'),
      },
    }),
  );
  list.push(
    ingest('too few samples', {
      body: { ...good(), samples: Buffer.alloc(200).toString('base64') },
    }),
  );
  // SQL and script strings in every text field.
  for (const s of SQL_AND_SCRIPT) {
    list.push(ingest(`uid ${s.slice(0, 20)}`, { body: { ...good(), uid: s } }));
    list.push(ingest(`pointTag ${s.slice(0, 20)}`, { body: { ...good(), pointTag: s } }));
    list.push({
      name: `sign-in email ${s.slice(0, 20)}`,
      method: 'POST',
      path: '/api/v1/auth/sign-in',
      body: { email: s, password: s },
      auth: 'none',
    });
    list.push({
      name: `gateway name ${s.slice(0, 20)} on unknown site`,
      method: 'POST',
      path: '/api/v1/gateways',
      body: { siteId: s, name: s },
      auth: 'admin',
    });
    list.push({
      name: `route param ${s.slice(0, 20)}`,
      method: 'GET',
      path: `/api/v1/snapshots/${encodeURIComponent(s)}`,
      auth: 'admin',
    });
  }
  // Control characters in one-line fields: a line break in a name would forge a line of
  // its own in a plain-text alert e-mail (Unicode §5.8 line ends, ISO/IEC 6429 controls).
  const CONTROL_STRINGS = [
    'Pump 7\r\nBcc: someone@example.org',
    'Pump 7\nSubject: forged',
    'tab\there',
    'bell\u0007',
    'next line\u0085x',
    'line separator\u2028x',
    'escape\u001b[31m',
  ];
  for (const s of CONTROL_STRINGS) {
    const what = JSON.stringify(s).slice(1, 24);
    list.push({
      name: `gateway name with control character ${what}`,
      method: 'POST',
      path: '/api/v1/gateways',
      body: { siteId: 1, name: s },
      auth: 'admin',
    });
    list.push({
      name: `area name with control character ${what}`,
      method: 'POST',
      path: '/api/v1/areas',
      body: { siteId: 1, name: s },
      auth: 'admin',
    });
    list.push({
      name: `invited user name with control character ${what}`,
      method: 'POST',
      path: '/api/v1/users/invite',
      body: { email: 'new.person@example.org', name: s, role: 'operator', siteIds: [1] },
      auth: 'admin',
    });
    list.push({
      name: `finding title with control character ${what}`,
      method: 'POST',
      path: '/api/v1/findings',
      body: { pointId: 1, title: s },
      auth: 'admin',
    });
  }
  // Batches.
  list.push(ingest('empty batch', { body: { snapshots: [] } }));
  list.push(
    ingest('batch of 101', { body: { snapshots: Array.from({ length: 101 }, () => good()) } }),
  );
  list.push(ingest('batch not an array', { body: { snapshots: 'many' } }));
  list.push(ingest('batch of nulls', { body: { snapshots: null } }));
  list.push(ingest('array body', { body: [good()] }));
  // Oversize.
  list.push(
    ingest('17 MiB body', {
      raw: JSON.stringify({ ...good(), samples: 'A'.repeat(17 * 1024 * 1024) }),
      headers: { 'content-type': 'application/json' },
    }),
  );
  list.push({
    name: 'dashboard 2 MiB body',
    method: 'POST',
    path: '/api/v1/auth/sign-in',
    raw: JSON.stringify({ email: 'a@b.c', password: 'x'.repeat(2 * 1024 * 1024) }),
    headers: { 'content-type': 'application/json' },
    auth: 'none',
  });
  // Keys.
  for (const h of [
    '',
    'Bearer',
    'Bearer ',
    'Basic dXNlcjpwYXNz',
    'Bearer tsg_zzzzzzzzzzzz_' + 'A'.repeat(32),
    'Bearer tsg_000000000000_' + 'A'.repeat(32),
    'Bearer ' + 'x'.repeat(4000),
    "Bearer ' OR 1=1 --",
  ])
    list.push({
      name: `api key ${JSON.stringify(h).slice(0, 30)}`,
      method: 'POST',
      path: '/api/ingest/v1/snapshots',
      body: good(),
      headers: h ? { authorization: h } : {},
      auth: 'none',
    });
  list.push(ingest('revoked key', { body: good(), auth: 'revoked' }));
  // The key is site MFP's: a tag of site TRB is not found, like a tag no site has.
  list.push(
    ingest("another site's point tag", { body: { ...good(), pointTag: 'TRB-P120-MDE-H' } }),
  );
  list.push(ingest('a point tag no site has', { body: { ...good(), pointTag: 'NO-SUCH-TAG' } }));
  // Tokens.
  const secret = srv.ctx.jwtSecret;
  const claims = { ver: 0 };
  const tokens: Record<string, string> = {
    'alg none': `${Buffer.from('{"alg":"none","typ":"JWT"}').toString('base64url')}.${Buffer.from(JSON.stringify({ sub: '1', ver: 0, iss: 'turnstone', aud: 'turnstone-dashboard' })).toString('base64url')}.`,
    expired: jwt.sign(claims, secret, {
      algorithm: 'HS256',
      subject: '1',
      issuer: 'turnstone',
      audience: 'turnstone-dashboard',
      expiresIn: -60,
    }),
    'wrong issuer': jwt.sign(claims, secret, {
      algorithm: 'HS256',
      subject: '1',
      issuer: 'someone',
      audience: 'turnstone-dashboard',
      expiresIn: 600,
    }),
    'wrong audience': jwt.sign(claims, secret, {
      algorithm: 'HS256',
      subject: '1',
      issuer: 'turnstone',
      audience: 'other',
      expiresIn: 600,
    }),
    'other secret': jwt.sign(claims, 'x'.repeat(40), {
      algorithm: 'HS256',
      subject: '1',
      issuer: 'turnstone',
      audience: 'turnstone-dashboard',
      expiresIn: 600,
    }),
    'HS512 with our secret': jwt.sign(claims, secret, {
      algorithm: 'HS512',
      subject: '1',
      issuer: 'turnstone',
      audience: 'turnstone-dashboard',
      expiresIn: 600,
    }),
    'old token version': jwt.sign({ ver: -1 }, secret, {
      algorithm: 'HS256',
      subject: '1',
      issuer: 'turnstone',
      audience: 'turnstone-dashboard',
      expiresIn: 600,
    }),
    'unknown user': jwt.sign(claims, secret, {
      algorithm: 'HS256',
      subject: '999999',
      issuer: 'turnstone',
      audience: 'turnstone-dashboard',
      expiresIn: 600,
    }),
    garbage: 'not.a.jwt',
    empty: '',
  };
  for (const [what, token] of Object.entries(tokens)) {
    list.push({
      name: `jwt ${what} on /me`,
      method: 'GET',
      path: '/api/v1/me',
      headers: { cookie: `turnstone_session=${token}` },
      auth: 'none',
    });
    list.push({
      name: `jwt ${what} creating a gateway`,
      method: 'POST',
      path: '/api/v1/gateways',
      body: { siteId: 1, name: 'x' },
      headers: { cookie: `turnstone_session=${token}` },
      auth: 'none',
    });
  }
  // Uploads: lying WAV headers, not-WAV-not-CSV, broken CSV, path-traversal names.
  const wav = (mutate: (b: Buffer) => void, size = 44 + 2048) => {
    const b = Buffer.alloc(size);
    b.write('RIFF', 0, 'latin1');
    b.writeUInt32LE(size - 8, 4);
    b.write('WAVE', 8, 'latin1');
    b.write('fmt ', 12, 'latin1');
    b.writeUInt32LE(16, 16);
    b.writeUInt16LE(1, 20);
    b.writeUInt16LE(1, 22);
    b.writeUInt32LE(10240, 24);
    b.writeUInt32LE(20480, 28);
    b.writeUInt16LE(2, 32);
    b.writeUInt16LE(16, 34);
    b.write('data', 36, 'latin1');
    b.writeUInt32LE(size - 44, 40);
    mutate(b);
    return b;
  };
  const files: Record<string, [Buffer | string, string]> = {
    'data chunk larger than the file': [wav((b) => b.writeUInt32LE(10_000_000, 40)), 'lying.wav'],
    'fmt says 8 bits': [wav((b) => b.writeUInt16LE(8, 34)), 'eight.wav'],
    'fmt says 0 channels': [wav((b) => b.writeUInt16LE(0, 22)), 'zero-ch.wav'],
    'sample rate 0': [wav((b) => b.writeUInt32LE(0, 24)), 'rate0.wav'],
    'compressed format tag': [wav((b) => b.writeUInt16LE(2, 20)), 'adpcm.wav'],
    'truncated after fmt': [wav(() => {}).subarray(0, 30), 'short.wav'],
    'RIFF without WAVE': [wav((b) => b.write('AVI ', 8, 'latin1')), 'avi.wav'],
    'no data chunk': [wav((b) => b.write('junk', 36, 'latin1')), 'nodata.wav'],
    'a PNG named .wav': [
      Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 1, 2, 3]),
      'picture.wav',
    ],
    'an ELF named .csv': [
      Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]), Buffer.alloc(64)]),
      'program.csv',
    ],
    'empty file': [Buffer.alloc(0), 'empty.csv'],
    'CSV with mixed columns': ['time,value\n0,0.1\n0.001,0.2,9\n0.002,0.3\n', 'mixed.csv'],
    'CSV with words': ['value\n0.1\nbanana\n0.3\n', 'words.csv'],
    'CSV with NaN': [
      'value\n' + Array.from({ length: 300 }, (_, i) => (i === 9 ? 'NaN' : '0.1')).join('\n'),
      'nan.csv',
    ],
    'CSV too short': ['value\n0.1\n0.2\n', 'short.csv'],
    'CSV time going back': [
      'time,value\n' +
        Array.from({ length: 300 }, (_, i) => `${i === 50 ? 0 : i / 1000},0.1`).join('\n'),
      'back.csv',
    ],
    'traversal name ../../etc/passwd': ['value\n0.1\n', '../../etc/passwd'],
    'traversal name ..\\..\\windows': ['not,a\nrecording,at,all\n', '..\\..\\windows\\win.ini'],
    'CSV with script in header': ['<script>alert(1)</script>\n0.1\n0.2\n', 'x.csv'],
    'one huge line': ['0.1,'.repeat(50_000), 'wide.csv'],
  };
  for (const [what, [content, fileName]] of Object.entries(files)) {
    const form = new FormData();
    form.set('sampleRateHz', '10240');
    form.set('file', new Blob([content]), fileName);
    list.push({
      name: `upload: ${what}`,
      method: 'POST',
      path: '/api/v1/points/1/uploads',
      raw: form,
      auth: 'admin',
    });
  }
  const noFile = new FormData();
  noFile.set('sampleRateHz', '10240');
  list.push({
    name: 'upload: no file',
    method: 'POST',
    path: '/api/v1/points/1/uploads',
    raw: noFile,
    auth: 'admin',
  });
  const badField = new FormData();
  badField.set('sensitivityMvPerG', '-5');
  badField.set('file', new Blob(['value\n0.1\n']), 'x.csv');
  list.push({
    name: 'upload: negative sensitivity',
    method: 'POST',
    path: '/api/v1/points/1/uploads',
    raw: badField,
    auth: 'admin',
  });
  // Unknown routes and methods.
  for (const p of [
    '/api/v1/snapshots/..%2F..%2Fetc%2Fpasswd',
    '/api/v1/points/%2e%2e%2f1/uploads',
    '/api/v2/fleet',
    '/api/ingest/v1/snapshots/1',
    '/api/v1/fleet/extra',
  ])
    list.push({ name: `route ${p}`, method: 'GET', path: p, auth: 'admin' });
  list.push({ name: 'DELETE fleet', method: 'DELETE', path: '/api/v1/fleet', auth: 'admin' });
  return list;
}

beforeAll(async () => {
  srv = await startTestServer({
    INGEST_MAX_PER_MIN: '100000',
    SIGN_IN_MAX_PER_IP: '100000',
    SIGN_IN_MAX_PER_ACCOUNT: '100000',
  });
  admin = await srv.signIn('admin');
  key = await srv.gatewayKey();
  const r = await (
    await srv.call('POST', '/api/v1/gateways', {
      cookie: admin,
      body: { siteId: 1, name: 'revoked' },
    })
  ).json();
  revokedKey = r.apiKey;
  await srv.call('POST', `/api/v1/gateways/${r.id}/revoke`, { cookie: admin });
});
afterAll(async () => {
  await srv?.stop();
});

describe('hostile and broken input', () => {
  it('the corpus has at least 200 requests', () => {
    const n = corpus().length;
    expect(n, `corpus size ${n}`).toBeGreaterThanOrEqual(200);
  });

  it('every bad request gets a 4xx with a clear error body, nothing is stored, the server stays up', async () => {
    const before = await stored();
    const failures: string[] = [];
    for (const bad of corpus()) {
      const headers: Record<string, string> = { ...(bad.headers ?? {}) };
      if (bad.auth === 'gateway') headers.authorization ??= `Bearer ${key}`;
      if (bad.auth === 'revoked') headers.authorization = `Bearer ${revokedKey}`;
      const res = await srv.call(bad.method, bad.path, {
        body: bad.body,
        raw: bad.raw,
        headers,
        cookie: bad.auth === 'admin' ? admin : undefined,
      });
      const text = await res.text();
      let body: { error?: { code?: unknown; message?: unknown } } | null = null;
      try {
        body = JSON.parse(text);
      } catch {
        body = null;
      }
      const ok =
        res.status >= 400 &&
        res.status < 500 &&
        typeof body?.error?.code === 'string' &&
        typeof body?.error?.message === 'string' &&
        (body.error.message as string).length > 5;
      if (!ok) failures.push(`${bad.name}: ${res.status} ${text.slice(0, 120)}`);
    }
    expect(failures).toEqual([]);
    expect(await stored()).toEqual(before);
    expect((await srv.call('GET', '/api/health')).status).toBe(200);
    // And a good request still works afterwards.
    expect(
      (
        await srv.call('POST', '/api/ingest/v1/snapshots', {
          body: good(),
          headers: { authorization: `Bearer ${key}` },
        })
      ).status,
    ).toBe(201);
  }, 120_000);
});
