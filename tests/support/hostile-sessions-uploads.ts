/**
 * The second half of the hostile-input corpus: forged and broken session tokens, uploads with
 * lying WAV headers, broken CSV and path-traversal names, and unknown routes and methods.
 */
import jwt from 'jsonwebtoken';
import type { BadRequest } from './hostile-requests.ts';

/** Requests with tokens signed by `secret` (the server's) or forged, bad uploads and unknown routes. */
export function badSessionsUploadsAndRoutes(secret: string): BadRequest[] {
  const list: BadRequest[] = [];
  // Tokens.
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
