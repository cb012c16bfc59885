import { z } from 'zod';
import { analysisSummarySchema, qualityFindingSchema } from './points.ts';

/**
 * Capture settings sent with an upload (multipart text fields, so numbers arrive as text).
 * Sensitivity defaults to the point's; a CSV without a time column needs the sample rate.
 */
const num = (min: number, max: number, what: string) =>
  z.coerce
    .number({ error: `${what} must be a number.` })
    .finite()
    .min(min, `${what} must be at least ${min}.`)
    .max(max, `${what} must be at most ${max}.`);
/** Empty form fields mean "not given". */
const optional = <T extends z.ZodType>(s: T) =>
  z.preprocess((v) => (v === '' || v === null ? undefined : v), s.optional());

export const uploadFieldsSchema = z.object({
  sensitivityMvPerG: optional(num(0.1, 100_000, 'Sensitivity')),
  fullScaleV: optional(num(0.001, 100, 'Full scale')),
  bits: optional(num(8, 32, 'ADC bits').int('ADC bits must be a whole number.')),
  speedRpm: optional(num(1, 200_000, 'Speed')),
  sampleRateHz: optional(num(100, 1_000_000, 'Sample rate')),
  unit: z.preprocess((v) => (v === '' ? undefined : v), z.enum(['g', 'volts']).default('g')),
  takenAt: optional(
    z.iso.datetime({ offset: true, error: 'Taken at must be an ISO date and time.' }),
  ),
});
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

export const uploadResultSchema = z.object({
  snapshotId: z.number().int(),
  status: z.enum(['queued', 'already-uploaded']),
  samples: z.number().int(),
  sampleRateHz: z.number(),
  encoding: z.enum(['int16', 'int24', 'int32', 'float32']),
});
export type UploadResult = z.infer<typeof uploadResultSchema>;

export const snapshotStatusSchema = z.object({
  id: z.number().int(),
  pointId: z.number().int(),
  source: z.enum(['gateway', 'upload']),
  status: z.enum(['queued', 'done', 'rejected', 'failed']),
  statusReason: z.string().nullable(),
  takenAt: z.string(),
  receivedAt: z.string(),
  sampleRateHz: z.number(),
  sampleCount: z.number().int(),
  fileName: z.string().nullable(),
  /** The capture's analysis in the same shape as a point's analyses, with its quality findings. */
  analysis: analysisSummarySchema.extend({ findings: z.array(qualityFindingSchema) }).nullable(),
});
export type SnapshotStatus = z.infer<typeof snapshotStatusSchema>;
