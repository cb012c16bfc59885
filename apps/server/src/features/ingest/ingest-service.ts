/**
 * Ingest: validate, store the raw snapshot and its analysis job in one transaction, answer.
 * No signal processing here. Exactly-once effect over at-least-once delivery: the uid is
 * unique, and a repeat is compared by content hash (same → 200, different → 409).
 */
import { isDuplicateKey } from '@turnstone/db/errors';
import { createHash } from 'node:crypto';
import { z, ZodError } from 'zod';
import {
  bytesPerSample,
  MAX_SAMPLES,
  MIN_SAMPLES,
  sampleValuesSchema,
  SNAPSHOT_FIELDS,
  snapshotInSchema,
  type SnapshotIn,
  type Encoding,
  type IngestResult,
} from '@turnstone/contracts/ingest';
import { checkFiniteFloat32, encodeSamples } from '@turnstone/dsp/sample-codec';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { zodDetails } from '../../lib/error-middleware.ts';
import { keyMatches, prefixOf } from '../../lib/gateway-keys.ts';
import * as repo from './ingest-repository.ts';
import { samplesForStorage } from './sample-storage.ts';

export interface GatewayPrincipal {
  id: number;
  siteId: number;
}

const lastTouched = new Map<number, number>();

/**
 * Short-lived caches on the hot path: a gateway looked up by key prefix, a point by its
 * site and tag (set-up changes clear the latter in this process).
 * Revoking or rotating a key clears the gateway cache in this process at once; other API
 * processes notice within GATEWAY_CACHE_MS.
 */
export const GATEWAY_CACHE_MS = 5_000;
export const POINT_CACHE_MS = 30_000;
type GatewayRow = Awaited<ReturnType<typeof repo.gatewayByPrefix>>;
type PointRow = Awaited<ReturnType<typeof repo.pointOfSite>>;
const gatewayCache = new Map<string, { at: number; row: GatewayRow }>();
const pointCache = new Map<string, { at: number; row: PointRow }>();

export function forgetGatewayKeys(): void {
  gatewayCache.clear();
}

/**
 * Set-up changed which point a (site, tag) names (a point created, retagged, moved or
 * deleted): this process looks again at once, so a gateway of the site a machine left stops
 * reaching its points. Other API processes notice within POINT_CACHE_MS.
 */
export function forgetPointTags(): void {
  pointCache.clear();
}

async function cached<V>(
  cache: Map<string, { at: number; row: V }>,
  key: string,
  ttlMs: number,
  load: () => Promise<V>,
): Promise<V> {
  const hit = cache.get(key);
  const now = Date.now();
  if (hit && now - hit.at < ttlMs) return hit.row;
  const row = await load();
  if (cache.size > 10_000) cache.clear();
  cache.set(key, { at: now, row });
  return row;
}

/** The gateway behind `Authorization: Bearer <key>`, or a 401. */
export async function authenticateGateway(
  ctx: AppContext,
  header: string | undefined,
): Promise<GatewayPrincipal> {
  const m = /^Bearer\s+(\S+)$/i.exec(header ?? '');
  if (!m)
    throw new AppError(
      'unauthenticated',
      'Send the gateway API key as "Authorization: Bearer <key>".',
      401,
    );
  const key = m[1]!;
  const prefix = prefixOf(key);
  const gateway = prefix
    ? await cached(gatewayCache, prefix, GATEWAY_CACHE_MS, () =>
        repo.gatewayByPrefix(ctx.db, prefix),
      )
    : undefined;
  if (!gateway || !keyMatches(key, gateway.keyHash))
    throw new AppError('invalid_api_key', 'The API key is not valid.', 401);
  if (gateway.revokedAt)
    throw new AppError('revoked_api_key', 'The API key has been revoked.', 401);
  const now = Date.now();
  if (now - (lastTouched.get(gateway.id) ?? 0) > 60_000) {
    lastTouched.set(gateway.id, now);
    await repo.touchGateway(ctx.db, gateway.id);
  }
  return { id: gateway.id, siteId: gateway.siteId };
}

export interface SnapshotToStore {
  uid: string;
  pointId: number;
  gatewayId: number | null;
  source: 'gateway' | 'upload';
  takenAt: Date;
  sampleRateHz: number;
  encoding: Encoding;
  bytes: Buffer;
  adcBits: number;
  fullScaleV: number;
  sensitivityMvPerG: number;
  speedRpm: number | null;
  tach: { pulseTimesS: number[]; pulsesPerRev: number } | null;
  uploadedBy?: number | null;
  fileName?: string | null;
}

export function contentHash(
  s: Omit<SnapshotToStore, 'uid' | 'gatewayId' | 'source' | 'uploadedBy' | 'fileName'>,
): string {
  const meta = JSON.stringify([
    s.pointId,
    s.takenAt.getTime(),
    s.sampleRateHz,
    s.encoding,
    s.adcBits,
    s.fullScaleV,
    s.sensitivityMvPerG,
    s.speedRpm,
    s.tach,
  ]);
  return createHash('sha256').update(meta).update(s.bytes).digest('hex');
}

/** Stores one snapshot (gateway or upload). Shared by the ingest API and uploads. */
export async function storeSnapshot(
  ctx: AppContext,
  s: SnapshotToStore,
): Promise<
  | { status: 'created' | 'duplicate' | 'conflict'; snapshotId: number }
  | { status: 'point_gone'; snapshotId: null }
> {
  const hash = contentHash(s);
  // New uids are the common case: insert straight away, and read the stored row only when
  // the unique index says the uid is taken (a repeat, or two deliveries racing).
  const stored = await samplesForStorage(s.bytes);
  try {
    const snapshotId = await repo.insertSnapshotWithJob(
      ctx.dbHandle,
      {
        uid: s.uid,
        pointId: s.pointId,
        gatewayId: s.gatewayId,
        source: s.source,
        takenAt: s.takenAt,
        sampleRateHz: s.sampleRateHz,
        sampleCount: s.bytes.length / bytesPerSample[s.encoding],
        encoding: s.encoding,
        adcBits: s.adcBits,
        fullScaleV: s.fullScaleV,
        sensitivityMvPerG: s.sensitivityMvPerG,
        speedRpm: s.speedRpm,
        tach: s.tach,
        samples: stored.samples,
        samplesCodec: stored.samplesCodec,
        contentHash: hash,
        status: 'queued',
        uploadedBy: s.uploadedBy ?? null,
        fileName: s.fileName ?? null,
      },
      ctx.config.INGEST_TIMEOUT_S * 1000,
    );
    // The point was deleted since it was looked up: nothing was stored.
    if (snapshotId === null) return { status: 'point_gone', snapshotId: null };
    return { status: 'created', snapshotId };
  } catch (err) {
    // A repeat (or two deliveries of one uid racing): compare with the stored content.
    // Uids are unique per sender, so the row found is this sender's own.
    if (isDuplicateKey(err)) {
      const again = await repo.snapshotByUid(ctx.db, s.gatewayId, s.uid);
      if (again)
        return {
          status: again.contentHash === hash ? 'duplicate' : 'conflict',
          snapshotId: again.id,
        };
    }
    throw err;
  }
}

const invalid = (uid: string | null, message: string, details?: unknown): IngestResult => ({
  uid,
  status: 'invalid',
  httpStatus: 400,
  error: { code: 'validation_failed', message, ...(details === undefined ? {} : { details }) },
});

/**
 * The shared schema, except that a base64 `samples` is not matched against the pattern: it
 * is only used for strings already known to be canonical base64 (see parseSnapshot).
 */
const snapshotCheckedBase64Schema = snapshotInSchema.safeExtend({
  samples: z.union([z.string().min(1), sampleValuesSchema]),
});

/**
 * snapshotInSchema's verdict, and the sample bytes when `samples` is base64. Matching the
 * base64 pattern over a 4,096-sample snapshot's 11 kB string cost more CPU than all the
 * other fields together (≈ 95 µs of ≈ 140 µs per request in the server's profile), and the
 * string was then decoded anyway. So decode first: when the bytes encode back to exactly
 * the string (canonical, padded base64, which is what gateways send), the string matches
 * the pattern, and the schema runs without it. Any other string (unpadded, stray or
 * URL-safe characters…) goes through snapshotInSchema itself, so what is accepted and the
 * error details are unchanged.
 */
export function parseSnapshot(
  raw: unknown,
): { success: true; data: SnapshotIn; bytes: Buffer | null } | { success: false; error: ZodError } {
  const samples = (raw as { samples?: unknown } | null)?.samples;
  if (typeof samples === 'string' && samples.length > 0) {
    const bytes = Buffer.from(samples, 'base64');
    if (bytes.toString('base64') === samples) {
      const parsed = snapshotCheckedBase64Schema.safeParse(raw);
      return parsed.success
        ? { success: true, data: parsed.data, bytes }
        : { success: false, error: parsed.error };
    }
  }
  const parsed = snapshotInSchema.safeParse(raw);
  return parsed.success
    ? { success: true, data: parsed.data, bytes: null }
    : { success: false, error: parsed.error };
}

/** Validates and stores one item from a gateway; never throws for the item's own faults. */
export async function ingestOne(
  ctx: AppContext,
  gateway: GatewayPrincipal,
  raw: unknown,
): Promise<IngestResult> {
  const uid =
    typeof (raw as { uid?: unknown })?.uid === 'string'
      ? ((raw as { uid: string }).uid.slice(0, 128) as string)
      : null;
  const parsed = parseSnapshot(raw);
  if (!parsed.success) {
    const details = zodDetails(parsed.error);
    return invalid(
      uid,
      `Invalid snapshot: ${details[0]?.path || 'body'}: ${details[0]?.message ?? 'invalid'}`,
      details,
    );
  }
  const s = parsed.data;
  let bytes: Buffer;
  try {
    // Values sent as a JSON array are checked as they are encoded; bytes (base64 or the
    // binary body) are checked for NaN and infinities once, below.
    const sentAsBytes = parsed.bytes !== undefined || typeof s.samples === 'string';
    bytes =
      parsed.bytes ??
      (typeof s.samples === 'string'
        ? Buffer.from(s.samples, 'base64')
        : bufferOf(encodeSamples(s.samples, s.encoding)));
    const n = bytes.length / bytesPerSample[s.encoding];
    if (!Number.isInteger(n))
      throw new RangeError(`${bytes.length} bytes is not a whole number of ${s.encoding} samples`);
    if (n < MIN_SAMPLES || n > MAX_SAMPLES)
      throw new RangeError(`${n} samples; a snapshot holds ${MIN_SAMPLES} to ${MAX_SAMPLES}`);
    if (s.sampleCount !== undefined && s.sampleCount !== n)
      throw new RangeError(`sampleCount says ${s.sampleCount} but samples holds ${n}`);
    if (s.encoding === 'float32' && sentAsBytes) checkFiniteFloat32(bytes);
  } catch (err) {
    return invalid(uid, `Invalid snapshot: samples: ${(err as Error).message}`, [
      { path: 'samples', message: (err as Error).message },
    ]);
  }
  // Only the gateway's own site is looked at: a tag that exists at another site is simply
  // not found, the same answer as a tag that exists nowhere, so a gateway learns nothing
  // about other sites' tags (and two sites may use the same tag).
  const point = await cached(pointCache, `${gateway.siteId}:${s.pointTag}`, POINT_CACHE_MS, () =>
    repo.pointOfSite(ctx.db, gateway.siteId, s.pointTag),
  );
  const unknownPoint = (): IngestResult => ({
    uid: s.uid,
    status: 'unknown_point',
    httpStatus: 404,
    error: {
      code: 'unknown_point',
      message: `No measurement point of this gateway's site has the tag "${s.pointTag}".`,
    },
  });
  if (!point) return unknownPoint();
  const r = await storeSnapshot(ctx, {
    uid: s.uid,
    pointId: point.id,
    gatewayId: gateway.id,
    source: 'gateway',
    takenAt: new Date(s.takenAt),
    sampleRateHz: s.sampleRateHz,
    encoding: s.encoding,
    bytes,
    adcBits: s.adc.bits,
    fullScaleV: s.adc.fullScaleV,
    sensitivityMvPerG: s.sensor.sensitivityMvPerG,
    speedRpm: s.speedRpm ?? null,
    tach: s.tach ?? null,
  });
  if (r.status === 'point_gone') {
    // Deleted since this process cached its tag: look again next time.
    forgetPointTags();
    return unknownPoint();
  }
  if (r.status === 'conflict')
    return {
      uid: s.uid,
      status: 'conflict',
      httpStatus: 409,
      snapshotId: r.snapshotId,
      error: {
        code: 'uid_conflict',
        message: `A different snapshot with uid "${s.uid}" is already stored.`,
      },
    };
  const ignoredFields = Object.keys(raw as object).filter((k) => !SNAPSHOT_FIELDS.has(k));
  return {
    uid: s.uid,
    status: r.status,
    httpStatus: r.status === 'created' ? 201 : 200,
    snapshotId: r.snapshotId,
    ...(ignoredFields.length > 0 ? { ignoredFields: ignoredFields.slice(0, 50) } : {}),
  };
}

export { ZodError };

/** The bytes of a Uint8Array as a Buffer, without copying. */
const bufferOf = (u: Uint8Array) => Buffer.from(u.buffer, u.byteOffset, u.byteLength);
