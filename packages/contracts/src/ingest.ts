import { z } from 'zod';

export const encodings = ['int16', 'int24', 'int32', 'float32'] as const;
export const encodingSchema = z.enum(encodings);
export type Encoding = z.infer<typeof encodingSchema>;
export const bytesPerSample: Record<Encoding, number> = {
  int16: 2,
  int24: 3,
  int32: 4,
  float32: 4,
};
export const encodingBits: Record<Encoding, number> = {
  int16: 16,
  int24: 24,
  int32: 32,
  float32: 32,
};

/** Shortest and longest capture accepted (samples). 2^20 samples is 16 s at 65.5 kHz. */
export const MIN_SAMPLES = 256;
export const MAX_SAMPLES = 1 << 20;
/** A capture stamped further ahead than this is refused (gateway clock gone wrong). */
export const MAX_FUTURE_MS = 10 * 60 * 1000;
export const MAX_BATCH = 100;

const base64Pattern = /^[A-Za-z0-9+/]*={0,2}$/;
/** `samples` as numbers: the values themselves, checked against the encoding later. */
export const sampleValuesSchema = z.array(z.number().finite()).min(MIN_SAMPLES).max(MAX_SAMPLES);

/**
 * One snapshot as a gateway posts it. Forward compatibility: fields this version does not
 * know (from newer gateway firmware) are accepted and ignored — not stored — and named in
 * the answer's `ignoredFields`, so an integrator sees a misspelt field at once. Known
 * fields are checked strictly. A change to a known field's meaning gets a new path
 * (/api/ingest/v2), never a silent reinterpretation under v1.
 */
export const snapshotInSchema = z
  .object({
    uid: z
      .string()
      .min(1)
      .max(128)
      .regex(/^[A-Za-z0-9._:@-]+$/, 'uid may hold letters, digits and . _ : @ - only'),
    pointTag: z.string().min(1).max(64),
    takenAt: z.iso.datetime({
      offset: true,
      message: 'takenAt must be an ISO 8601 date-time with a zone',
    }),
    sampleRateHz: z.number().finite().min(100).max(1_000_000),
    encoding: encodingSchema,
    /** Little-endian samples in `encoding`, base64; or the sample values as numbers. */
    samples: z.union([
      z.string().min(1).regex(base64Pattern, 'samples is not valid base64'),
      sampleValuesSchema,
    ]),
    /** Optional: the number of samples the gateway meant to send; checked when given. */
    sampleCount: z.number().int().min(MIN_SAMPLES).max(MAX_SAMPLES).optional(),
    adc: z.object({
      bits: z.number().int().min(8).max(32),
      fullScaleV: z.number().finite().positive().max(100),
    }),
    sensor: z.object({ sensitivityMvPerG: z.number().finite().min(0.1).max(100_000) }),
    speedRpm: z.number().finite().min(1).max(200_000).optional(),
    tach: z
      .object({
        pulseTimesS: z.array(z.number().finite().min(0)).min(2).max(100_000),
        pulsesPerRev: z.number().int().min(1).max(1024),
      })
      .optional(),
  })
  .superRefine((s, ctx) => {
    const t = Date.parse(s.takenAt);
    if (t > Date.now() + MAX_FUTURE_MS)
      ctx.addIssue({ code: 'custom', path: ['takenAt'], message: 'takenAt lies in the future' });
    if (t < Date.UTC(2000, 0, 1))
      ctx.addIssue({ code: 'custom', path: ['takenAt'], message: 'takenAt is before 2000' });
    if (s.encoding !== 'float32' && s.adc.bits > encodingBits[s.encoding])
      ctx.addIssue({
        code: 'custom',
        path: ['adc', 'bits'],
        message: `adc.bits exceeds the ${s.encoding} encoding`,
      });
    if (s.tach) {
      const p = s.tach.pulseTimesS;
      for (let i = 1; i < p.length; i++)
        if (!(p[i]! > p[i - 1]!)) {
          ctx.addIssue({
            code: 'custom',
            path: ['tach', 'pulseTimesS', i],
            message: 'pulse times must increase',
          });
          break;
        }
    }
  });
export type SnapshotIn = z.infer<typeof snapshotInSchema>;
/** The top-level fields a snapshot may carry; any other is ignored (see snapshotInSchema). */
export const SNAPSHOT_FIELDS: ReadonlySet<string> = new Set(Object.keys(snapshotInSchema.shape));

/** A batch: `{ snapshots: [...] }` of 1 to MAX_BATCH items, each checked on its own. */
export const ingestBatchSchema = z.object({
  snapshots: z.array(z.unknown()).min(1).max(MAX_BATCH),
});

/** An ingest body: one snapshot object (checked by snapshotInSchema), or a batch. */
export const ingestBodySchema = z.union([
  ingestBatchSchema.strict(),
  z.record(z.string(), z.unknown()),
]);

export const ingestItemStatus = [
  'created',
  'duplicate',
  'conflict',
  'invalid',
  // Another site's tag is unknown_point too: a gateway cannot tell it from a tag no site has.
  'unknown_point',
] as const;
export const ingestResultSchema = z.object({
  uid: z.string().nullable(),
  status: z.enum(ingestItemStatus),
  httpStatus: z.number().int(),
  snapshotId: z.number().int().optional(),
  /** Top-level fields of the item this version does not know: accepted, not stored. */
  ignoredFields: z.array(z.string()).optional(),
  error: z
    .object({ code: z.string(), message: z.string(), details: z.unknown().optional() })
    .optional(),
});
export type IngestResult = z.infer<typeof ingestResultSchema>;
export const ingestBatchResponseSchema = z.object({ results: z.array(ingestResultSchema) });
