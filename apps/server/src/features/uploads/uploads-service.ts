/**
 * Uploads of portable-instrument recordings (WAV or CSV) for a point. The content decides
 * the format, not the name; a bad file gets a clear error and stores nothing. Accepted
 * files become snapshots and go through the same queue and analysis as gateway captures.
 */
import { createHash } from 'node:crypto';
import { CSV_DEFAULT_BITS, CSV_DEFAULT_FULL_SCALE_V, readCsv, wavCapture } from '@turnstone/dsp';
import { MAX_SAMPLES, MIN_SAMPLES } from '@turnstone/contracts/ingest';
import { uploadFieldsSchema, type UploadFields } from '@turnstone/contracts/uploads';
import { AppError } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { accessiblePoint } from '../../lib/point-access.ts';
import { storeSnapshot } from '../ingest/ingest-service.ts';
import { snapshotByUid } from '../ingest/ingest-repository.ts';
import { encodeSamples } from '../ingest/sample-bytes.ts';

export const MAX_UPLOAD_BYTES = 32 * 1024 * 1024;

export { uploadFieldsSchema, type UploadFields };

const bad = (message: string) => new AppError('invalid_file', message, 400);

/** A file name fit to show: no folders, no control characters, at most 200 characters. */
export function safeFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? 'upload';
  // eslint-disable-next-line no-control-regex
  return base.replace(/[\u0000-\u001f\u007f]/g, '').slice(0, 200) || 'upload';
}

function looksLikeText(bytes: Buffer): boolean {
  const n = Math.min(bytes.length, 4096);
  for (let i = 0; i < n; i++) {
    const c = bytes[i]!;
    if (c === 0 || (c < 9 && c !== 0) || (c > 13 && c < 32 && c !== 27)) return false;
  }
  return true;
}

export async function acceptUpload(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  file: { buffer: Buffer; originalname: string } | undefined,
  rawFields: unknown,
) {
  const { point } = await accessiblePoint(ctx.db, user, pointId);
  if (!file || file.buffer.length === 0)
    throw bad(file ? 'The file is empty.' : 'Attach a WAV or CSV file in the field "file".');
  // Browsers send a bare name; a name with folders or ".." was crafted, so refuse it.
  if (/[\\/]/.test(file.originalname) || /^\.\.?$/.test(file.originalname))
    throw bad(
      `The file name "${safeFileName(file.originalname)}" must not contain folders or "..".`,
    );
  const fields = uploadFieldsSchema.parse(rawFields);
  const sensitivity = fields.sensitivityMvPerG ?? point.sensitivityMvPerG;
  const bytes = file.buffer;
  const isWav =
    bytes.length >= 12 &&
    bytes.toString('latin1', 0, 4) === 'RIFF' &&
    bytes.toString('latin1', 8, 12) === 'WAVE';

  let encoding: 'int16' | 'int24' | 'int32' | 'float32';
  let sampleBytes: Buffer;
  let sampleRateHz: number;
  let adcBits: number;
  let fullScaleV: number;
  let count: number;
  if (isWav) {
    // The same reading as the analyzer CLI: full scale of the container (PCM samples are
    // left-justified), float 1.0 = full scale; float samples come back as volts.
    let wav;
    try {
      wav = wavCapture(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
        ...(fields.bits === undefined ? {} : { bits: fields.bits }),
        ...(fields.fullScaleV === undefined ? {} : { fullScaleV: fields.fullScaleV }),
      });
    } catch (err) {
      throw bad(`Not a readable WAV file: ${(err as Error).message}`);
    }
    encoding = wav.encoding;
    sampleRateHz = wav.sampleRateHz;
    adcBits = wav.adc.bits;
    fullScaleV = wav.adc.fullScaleV;
    count = wav.samples.length;
    sampleBytes = encodeSamples(Array.from(wav.samples), encoding);
  } else if (looksLikeText(bytes)) {
    let csv;
    try {
      csv = readCsv(bytes.toString('utf8'));
    } catch (err) {
      throw bad(`Not a readable CSV file: ${(err as Error).message}`);
    }
    const rate = csv.sampleRateHz ?? fields.sampleRateHz;
    if (!rate) throw bad('This CSV has no time column: give the sample rate (sampleRateHz).');
    sampleRateHz = rate;
    encoding = 'float32';
    adcBits = fields.bits ?? CSV_DEFAULT_BITS;
    fullScaleV = fields.fullScaleV ?? CSV_DEFAULT_FULL_SCALE_V;
    count = csv.values.length;
    const toVolts = fields.unit === 'g' ? sensitivity / 1000 : 1;
    sampleBytes = encodeSamples(
      Array.from(csv.values, (v) => v * toVolts),
      'float32',
    );
  } else {
    throw bad('The file is neither WAV (RIFF/WAVE) nor CSV text.');
  }
  if (count < MIN_SAMPLES || count > MAX_SAMPLES)
    throw bad(
      `The recording holds ${count} samples; ${MIN_SAMPLES} to ${MAX_SAMPLES} are accepted.`,
    );
  if (sampleRateHz < 100 || sampleRateHz > 1_000_000)
    throw bad(`Sample rate ${sampleRateHz} Hz is outside 100 Hz to 1 MHz.`);

  const digest = createHash('sha256').update(bytes).digest('hex');
  const uid = `upload-${pointId}-${digest.slice(0, 40)}`;
  // Without a stated time the upload time stands in; a repeat of the same file keeps the
  // first one's, so it is recognised as the same upload rather than a conflict.
  const earlier = fields.takenAt ? undefined : await snapshotByUid(ctx.db, null, uid);
  const takenAt = fields.takenAt ? new Date(fields.takenAt) : (earlier?.takenAt ?? new Date());
  const result = await storeSnapshot(ctx, {
    uid,
    pointId,
    gatewayId: null,
    source: 'upload',
    takenAt,
    sampleRateHz,
    encoding,
    bytes: sampleBytes,
    adcBits,
    fullScaleV,
    sensitivityMvPerG: sensitivity,
    speedRpm: fields.speedRpm ?? null,
    tach: null,
    uploadedBy: user.id,
    fileName: safeFileName(file.originalname),
  });
  if (result.status === 'conflict')
    throw new AppError(
      'upload_conflict',
      `This file was already uploaded for this point with other capture settings (snapshot ${result.snapshotId}).`,
      409,
    );
  return {
    snapshotId: result.snapshotId,
    status: result.status === 'created' ? ('queued' as const) : ('already-uploaded' as const),
    samples: count,
    sampleRateHz,
    encoding,
  };
}
