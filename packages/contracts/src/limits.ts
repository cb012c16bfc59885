import { z } from 'zod';
import { freeText, oneLine } from './text.ts';

/**
 * Limit sets: the bands of a point (or of a machine-type template) as
 * `@turnstone/condition`'s `BandDefinition`, and the Limits screen's requests. The schemas
 * check shape and simple ranges; the server also runs `checkBandDefinition` on every band.
 */

export const bandSpectrumSchema = z.enum(['acceleration', 'velocity', 'displacement', 'envelope']);
export const bandMeasureSchema = z.enum(['rms', 'peak', 'peak-to-peak']);
export const bandUnitSchema = z.enum(['g', 'mm/s', 'um']);
export const faultFrequencyNameSchema = z.enum([
  '1x',
  '2x',
  '3x',
  'bpfo',
  'bpfi',
  'bsf',
  'ftf',
  'gear-mesh',
  'blade-pass',
]);
export const halfWidthUnitSchema = z.enum(['hz', 'order', 'percent']);
export const statisticalCombineSchema = z.enum(['min', 'max', 'statistical']);

const finite = z.number().finite();

export const baselineSourceSchema = z.discriminatedUnion('from', [
  z.object({ from: z.literal('first-n'), count: z.number().int().min(2).max(10_000) }),
  z.object({ from: z.literal('period'), fromAt: finite, toAt: finite }),
]);

export const baselineStatsSchema = z.object({
  count: z.number().int(),
  mean: finite,
  sigma: finite,
  /** Mean and σ of ln(value): the statistical level is set in the log domain. */
  logMean: finite.optional(),
  logSigma: finite.optional(),
  /** Days between the baseline's first and last value. */
  spanDays: finite.optional(),
});

export const statisticalRuleSchema = z.object({
  kAlert: finite.positive(),
  kDanger: finite.positive().optional(),
  baseline: baselineSourceSchema,
  established: baselineStatsSchema.optional(),
  includeSuspect: z.boolean().optional(),
  combine: statisticalCombineSchema.optional(),
});

const bandCommon = {
  key: z
    .string()
    .trim()
    .min(1, 'Give the band a key.')
    .max(64)
    .regex(/^[a-z0-9][a-z0-9-]*$/, 'Use lower-case letters, digits and dashes.'),
  name: oneLine(z.string().trim().min(1, 'Give the band a name.').max(200)),
  spectrum: bandSpectrumSchema,
  measure: bandMeasureSchema,
  unit: bandUnitSchema,
  alertLevel: finite.min(0, 'The alert level must be 0 or more.'),
  dangerLevel: finite.min(0, 'The danger level must be 0 or more.'),
  persistence: z.number().int().min(1).max(100).optional(),
  clearPersistence: z.number().int().min(1).max(100).optional(),
  /** Hours the values must stay below the clear level before a raised band clears. */
  clearAfterHours: finite.min(0).max(8760).optional(),
  hysteresis: finite.gt(0).max(1).optional(),
  statistical: statisticalRuleSchema.optional(),
  levelSource: oneLine(z.string().max(200)).optional(),
};

export const bandDefinitionSchema = z.discriminatedUnion('kind', [
  z.object({
    ...bandCommon,
    kind: z.literal('overall'),
    fromHz: finite.min(0).optional(),
    toHz: finite.positive().optional(),
  }),
  z.object({
    ...bandCommon,
    kind: z.literal('hz'),
    fromHz: finite.min(0),
    toHz: finite.positive(),
  }),
  z.object({
    ...bandCommon,
    kind: z.literal('order'),
    fromOrder: finite.min(0),
    toOrder: finite.positive(),
  }),
  z.object({
    ...bandCommon,
    kind: z.literal('fault'),
    fault: faultFrequencyNameSchema,
    halfWidth: finite.positive(),
    halfWidthUnit: halfWidthUnitSchema,
    harmonics: z.number().int().min(1).max(20).optional(),
    component: oneLine(z.string().max(100)).optional(),
  }),
]);
export type BandDefinitionInput = z.infer<typeof bandDefinitionSchema>;

const bandList = z
  .array(bandDefinitionSchema)
  .max(64)
  .refine((list) => new Set(list.map((b) => b.key)).size === list.length, {
    message: 'Each band needs its own key.',
  });

/** `GET /api/v1/points/:id/limits` */
export const limitSetResponseSchema = z.object({
  pointId: z.number().int(),
  name: z.string(),
  version: z.number().int(),
  bands: z.array(bandDefinitionSchema),
  updatedBy: z.string().nullable(),
  updatedAt: z.string().nullable(),
  machine: z.object({
    id: z.number().int(),
    name: z.string(),
    type: z.string(),
    isoGroup: z.number().int(),
    foundation: z.enum(['rigid', 'flexible']),
    nominalRpm: z.number(),
  }),
  point: z.object({ id: z.number().int(), tag: z.string(), name: z.string() }),
});
export type LimitSetResponse = z.infer<typeof limitSetResponseSchema>;

/** `PUT /api/v1/points/:id/limits` (engineer): the whole set and why. */
export const saveLimitSetRequestSchema = z.object({
  bands: bandList,
  reason: freeText(
    z.string().trim().min(3, 'Say why the limits change (at least 3 characters).').max(1000),
  ),
});
export type SaveLimitSetRequest = z.infer<typeof saveLimitSetRequestSchema>;

export const saveLimitSetResponseSchema = z.object({
  version: z.number().int(),
  /** Open alerts cleared because their band was removed. */
  clearedAlertIds: z.array(z.number().int()),
});

/** `POST /api/v1/points/:id/limits/replay` (engineer) */
export const replayRequestSchema = z.object({ bands: bandList });

export const replayResponseSchema = z.object({
  /** Snapshots in the history that was replayed. */
  snapshots: z.number().int(),
  from: z.string().nullable(),
  to: z.string().nullable(),
  totals: z.object({ alerts: z.number().int(), reachedDanger: z.number().int() }),
  qualityNotices: z.array(z.string()),
  bands: z.array(
    z.object({
      bandKey: z.string(),
      bandName: z.string(),
      unit: z.string(),
      alertLevel: z.number(),
      dangerLevel: z.number(),
      evaluated: z.number().int(),
      byLevel: z.object({ alert: z.number().int(), danger: z.number().int() }),
      alerts: z.array(
        z.object({
          raisedLevel: z.enum(['alert', 'danger']),
          raisedAt: z.string(),
          raisedValue: z.number(),
          escalatedAt: z.string().nullable(),
          clearedAt: z.string().nullable(),
          peakValue: z.number(),
        }),
      ),
      /** The stored values of this band, oldest first, to draw the replay on. */
      values: z.array(
        z.object({ t: z.string(), v: z.number(), q: z.enum(['ok', 'suspect', 'unusable']) }),
      ),
    }),
  ),
});
export type ReplayResponse = z.infer<typeof replayResponseSchema>;

/** `GET /api/v1/points/:id/limits/iso-defaults` */
export const isoDefaultsResponseSchema = z.object({
  isoGroup: z.number().int(),
  foundation: z.enum(['rigid', 'flexible']),
  alertLevel: z.number(),
  dangerLevel: z.number(),
  unit: z.literal('mm/s'),
  source: z.string(),
});
export type IsoDefaultsResponse = z.infer<typeof isoDefaultsResponseSchema>;

/** `GET /api/v1/points/:id/limits/suggest?band=&k=&count=` */
export const suggestQuerySchema = z.object({
  band: z.string().min(1).max(64),
  kAlert: z.coerce.number().positive().max(20).default(3),
  kDanger: z.coerce.number().positive().max(40).default(6),
  count: z.coerce
    .number()
    .int()
    .min(
      30,
      'A statistical level needs a baseline of at least 30 usable values over at least 7 days.',
    )
    .max(10_000)
    .default(30),
});
export const suggestResponseSchema = z.object({
  bandKey: z.string(),
  baseline: baselineStatsSchema.nullable(),
  alertLevel: z.number().nullable(),
  dangerLevel: z.number().nullable(),
  kAlert: z.number(),
  kDanger: z.number(),
  /** Why there is no suggestion, when there is none. */
  message: z.string().nullable(),
});
export type SuggestResponse = z.infer<typeof suggestResponseSchema>;

/** `GET /api/v1/points/:id/limits/history`: the audit rows of the point's limits. */
export const limitHistoryResponseSchema = z.object({
  items: z.array(
    z.object({
      id: z.number().int(),
      at: z.string(),
      action: z.string(),
      actor: z.string().nullable(),
      reason: z.string().nullable(),
      /** Band keys added, removed and changed, for the list. */
      added: z.array(z.string()),
      removed: z.array(z.string()),
      changed: z.array(z.string()),
    }),
  ),
});
export type LimitHistoryResponse = z.infer<typeof limitHistoryResponseSchema>;

/** `GET/PUT /api/v1/limit-templates/:machineType` (engineer) */
export const limitTemplateResponseSchema = z.object({
  machineType: z.string(),
  /** `stored`: an engineer saved it; `built-in`: the condition package's template. */
  source: z.enum(['stored', 'built-in']),
  version: z.number().int(),
  bands: z.array(bandDefinitionSchema),
});
export const saveLimitTemplateRequestSchema = saveLimitSetRequestSchema;
