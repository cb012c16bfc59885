/**
 * Uploads of portable-instrument recordings (WAV or CSV) for a point. The content decides
 * the format, not the name; a bad file gets a clear error and stores nothing. Accepted
 * files become snapshots and go through the same queue and analysis as gateway captures.
 */
import { uploadFieldsSchema, type UploadFields } from '@turnstone/contracts/uploads';
import { AppError, notFound } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { storeSnapshot } from '../ingest/ingest-service.ts';
import { snapshotByUid } from '../ingest/ingest-repository.ts';
import { checkWavFrames, isWavBytes, MAX_UPLOAD_BYTES } from './upload-bounds.ts';
import { writeAudit } from '../audit/audit-repository.ts';
import { readRecordingOffThread } from './upload-pool.ts';

export { MAX_UPLOAD_BYTES };
export { uploadFieldsSchema, type UploadFields };

const bad = (message: string) => new AppError('invalid_file', message, 400);

/** A file name fit to show: no folders, no control characters, at most 200 characters. */
export function safeFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? 'upload';
  // eslint-disable-next-line no-control-regex
  return base.replace(/[\u0000-\u001f\u007f]/g, '').slice(0, 200) || 'upload';
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
  // The rows of a CSV were counted as it arrived (upload-bounds.ts); a WAV's frames are in
  // its header. Both bounds hold before any sample is read.
  if (isWavBytes(bytes)) checkWavFrames(bytes);
  const read = await readRecordingOffThread({
    bytes,
    bits: fields.bits,
    fullScaleV: fields.fullScaleV,
    sampleRateHz: fields.sampleRateHz,
    unit: fields.unit,
    sensitivityMvPerG: sensitivity,
  });
  if (!read.ok)
    throw read.status === 413
      ? new AppError('payload_too_large', read.message, 413)
      : bad(read.message);
  const { encoding, sampleRateHz, adcBits, fullScaleV, count, digest } = read;
  const sampleBytes = Buffer.from(
    read.sampleBytes.buffer,
    read.sampleBytes.byteOffset,
    read.sampleBytes.byteLength,
  );

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
  if (result.status === 'point_gone') throw notFound('Point');
  if (result.status === 'conflict')
    throw new AppError(
      'upload_conflict',
      `This file was already uploaded for this point with other capture settings (snapshot ${result.snapshotId}).`,
      409,
    );
  // The capture is stored by the ingest path's own multi-statement transaction, so the
  // record of who uploaded what follows right after it (a repeat of the file is not logged).
  if (result.status === 'created')
    await writeAudit(ctx.db, {
      actorUserId: user.id,
      action: 'upload.create',
      entity: 'point',
      entityId: pointId,
      after: {
        fileName: safeFileName(file.originalname),
        snapshot: result.snapshotId,
        takenAt: takenAt.toISOString(),
        samples: count,
        sampleRateHz,
      },
    });
  return {
    snapshotId: result.snapshotId,
    status: result.status === 'created' ? ('queued' as const) : ('already-uploaded' as const),
    samples: count,
    sampleRateHz,
    encoding,
  };
}
