/**
 * The second half of the hostile-input corpus: forged and broken session tokens, uploads with
 * lying WAV headers, broken CSV and path-traversal names, and unknown routes and methods.
 */
import jwt from 'jsonwebtoken';
import { adminPost, type BadRequest } from './hostile-requests.ts';
import { pcmWavBytes } from './wav-bytes.ts';

/** An upload to point 1 of these form fields and, where given, this file (content, name). */
const upload = (what: string, fields: Record<string, string>, file?: [Buffer | string, string]) => {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  if (file) form.set('file', new Blob([file[0]]), file[1]);
  return adminPost(`upload: ${what}`, '/api/v1/points/1/uploads', { raw: form });
};

/** Requests with tokens signed by `secret` (the server's) or forged, bad uploads and unknown routes. */
export function badSessionsUploadsAndRoutes(secret: string): BadRequest[] {
  const list: BadRequest[] = [];
  // Tokens.
  // A session token as the server signs one (HS256, user 1, ten minutes), but for `o`.
  const sign = (o: Partial<jwt.SignOptions> & { claims?: object; key?: string } = {}): string => {
    const { claims = { ver: 0 }, key = secret, ...options } = o;
    return jwt.sign(claims, key, {
      algorithm: 'HS256',
      subject: '1',
      issuer: 'turnstone',
      audience: 'turnstone-dashboard',
      expiresIn: 600,
      ...options,
    });
  };
  const tokens: Record<string, string> = {
    'alg none': `${Buffer.from('{"alg":"none","typ":"JWT"}').toString('base64url')}.${Buffer.from(JSON.stringify({ sub: '1', ver: 0, iss: 'turnstone', aud: 'turnstone-dashboard' })).toString('base64url')}.`,
    expired: sign({ expiresIn: -60 }),
    'wrong issuer': sign({ issuer: 'someone' }),
    'wrong audience': sign({ audience: 'other' }),
    'other secret': sign({ key: 'x'.repeat(40) }),
    'HS512 with our secret': sign({ algorithm: 'HS512' }),
    'old token version': sign({ claims: { ver: -1 } }),
    'unknown user': sign({ subject: '999999' }),
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
  // A sound 16-bit PCM file of 1024 samples at 10240 Hz (44-byte header), then `mutate`d.
  const wav = (mutate: (b: Buffer) => void) => {
    const b = Buffer.from(pcmWavBytes(new Int16Array(1024), 10240, 16));
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
    list.push(upload(what, { sampleRateHz: '10240' }, [content, fileName]));
  }
  list.push(upload('no file', { sampleRateHz: '10240' }));
  list.push(upload('negative sensitivity', { sensitivityMvPerG: '-5' }, ['value\n0.1\n', 'x.csv']));
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
