/**
 * The generated corpus of hostile and broken requests (tests/api/hostile-input.test.ts): the
 * ingest API's bodies, batches and keys, and hostile strings in every text field. Each must get
 * a 4xx with a clear error body and store nothing.
 */
import { snapshotBody } from './signals.ts';

export const TAG = 'MFP-P101-MDE-H';

export interface BadRequest {
  name: string;
  method: string;
  path: string;
  headers?: Record<string, string>;
  raw?: string | FormData;
  body?: unknown;
  auth?: 'gateway' | 'revoked' | 'admin' | 'none';
}

/** A snapshot body that is fine, with a fresh uid. */
export const good = () => snapshotBody(TAG, `good-${Math.random().toString(36).slice(2)}`);
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

/** A request to the ingest API with the gateway's key unless `x` says otherwise. */
const ingest = (name: string, x: Partial<BadRequest>): BadRequest => ({
  name: `ingest: ${name}`,
  method: 'POST',
  path: '/api/ingest/v1/snapshots',
  auth: 'gateway',
  ...x,
});

/** A POST to the dashboard API signed in as the administrator. */
export const adminPost = (name: string, path: string, x: Partial<BadRequest>): BadRequest => ({
  name,
  method: 'POST',
  path,
  auth: 'admin',
  ...x,
});

/** Malformed JSON, deep nesting, wrong content types, wrong and missing fields, NaN and infinity. */
export function malformedIngestBodies(): BadRequest[] {
  const list: BadRequest[] = [];
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
  return list;
}

/** SQL, script and control-character strings in every text field, ingest and dashboard. */
export function hostileTextFields(): BadRequest[] {
  const list: BadRequest[] = [];
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
    list.push(
      adminPost(`gateway name ${s.slice(0, 20)} on unknown site`, '/api/v1/gateways', {
        body: { siteId: s, name: s },
      }),
    );
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
  // The one-line fields: what each is, where it is posted, the body carrying the string.
  const ONE_LINE_FIELDS: [string, string, (s: string) => unknown][] = [
    ['gateway name', '/api/v1/gateways', (s) => ({ siteId: 1, name: s })],
    ['area name', '/api/v1/areas', (s) => ({ siteId: 1, name: s })],
    [
      'invited user name',
      '/api/v1/users/invite',
      (s) => ({ email: 'new.person@example.org', name: s, role: 'operator', siteIds: [1] }),
    ],
    ['finding title', '/api/v1/findings', (s) => ({ pointId: 1, title: s })],
  ];
  for (const s of CONTROL_STRINGS) {
    const what = JSON.stringify(s).slice(1, 24);
    for (const [field, path, body] of ONE_LINE_FIELDS)
      list.push(adminPost(`${field} with control character ${what}`, path, { body: body(s) }));
  }
  return list;
}

/** Bad batches, oversize bodies, malformed, revoked and foreign keys and tags. */
export function badBatchesAndKeys(): BadRequest[] {
  const list: BadRequest[] = [];
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
  return list;
}
