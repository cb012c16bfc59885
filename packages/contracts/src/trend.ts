import { z } from 'zod';

/**
 * The period a trend covers when no times are asked: the last 90 days up to the server's
 * clock. The web app opens a point's trend on it without times, so the address is known to
 * the server before the page runs (it preloads that request with the page).
 */
export const DEFAULT_TREND_DAYS = 90;

/**
 * `GET /api/v1/points/:id/trend?band=<key>&from=<iso>&to=<iso>` — one band of one point
 * over a period (default: the last {@link DEFAULT_TREND_DAYS} days), oldest first, with the
 * levels in force and the projection to the next level.
 */
export const trendQuerySchema = z.object({
  band: z.string().min(1).max(64).default('overall-velocity'),
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
});
export type TrendQuery = z.infer<typeof trendQuerySchema>;

export const trendPointSchema = z.object({
  /** takenAt, ISO 8601 UTC */
  t: z.string(),
  v: z.number(),
  /** quality verdict of the capture */
  q: z.enum(['ok', 'suspect', 'unusable']),
  analysisId: z.number().int(),
});

/** A band's alert and danger levels and where they come from. */
export const trendLevelsSchema = z.object({
  alert: z.number(),
  danger: z.number(),
  source: z.enum(['fixed', 'statistical']),
});

export const trendResponseSchema = z.object({
  pointId: z.number().int(),
  band: z.object({ key: z.string(), name: z.string(), unit: z.string(), spectrum: z.string() }),
  /** Levels in force now (statistical levels applied when established). */
  levels: z.object({
    alert: z.number(),
    danger: z.number(),
    source: z.enum(['fixed', 'statistical']),
  }),
  baseline: z.object({ mean: z.number(), sigma: z.number(), count: z.number() }).nullable(),
  /**
   * Oldest first. A long period comes thinned to each time bucket's lowest and highest value
   * (with the first, the last and those behind alert transitions): see `decimation`.
   */
  items: z.array(trendPointSchema),
  /** How `items` were thinned; null when every value of the period is there. */
  decimation: z
    .object({
      /** Values in the period. */
      total: z.number().int(),
      /** Width of one bucket in milliseconds. */
      bucketMs: z.number().int(),
    })
    .nullable(),
  projection: z.object({
    outcome: z.enum([
      'projected',
      'too-few-points',
      'above-danger',
      'not-rising',
      'beyond-horizon',
    ]),
    model: z.enum(['linear', 'exponential']).nullable(),
    r2: z.number().nullable(),
    target: z.object({ level: z.enum(['alert', 'danger']), value: z.number() }).nullable(),
    crossingAt: z.string().nullable(),
    /** The fit already reached the target: the level is due now (crossingAt is now). */
    overdue: z.boolean().optional(),
    /** The values the fit ran over: the recent regime after the latest change point. */
    window: z
      .object({ from: z.string(), to: z.string(), points: z.number().int(), changed: z.boolean() })
      .nullable()
      .optional(),
  }),
  /** Alert raises/escalations/acks/clears of this band in the period, for markers. */
  events: z.array(
    z.object({
      t: z.string(),
      kind: z.enum(['raised', 'escalated', 'acknowledged', 'cleared']),
      level: z.enum(['alert', 'danger']),
      alertId: z.number().int(),
      /** Who acted (an acknowledgement); null for the worker's own events. */
      by: z.string().nullable(),
      /** The note written with it; null when none. */
      note: z.string().nullable(),
    }),
  ),
  /** Maintenance findings on this point (of this band or of no band) in the period, for markers. */
  findings: z.array(
    z.object({
      t: z.string(),
      title: z.string(),
      workOrderRef: z.string().nullable(),
      /** Where the work stands now. */
      state: z.enum(['open', 'planned', 'done']),
    }),
  ),
  /**
   * Changes of the point's limit set in the period that touched this band (from the audit
   * record), oldest first: the band's levels in force before and after, in the band's unit.
   */
  limitChanges: z.array(
    z.object({
      t: z.string(),
      /** `baseline`: a statistical baseline was established (no one acted). */
      kind: z.enum(['changed', 'added', 'removed', 'baseline']),
      by: z.string().nullable(),
      /** The reason given with the change. */
      reason: z.string().nullable(),
      before: trendLevelsSchema.nullable(),
      after: trendLevelsSchema.nullable(),
    }),
  ),
  /**
   * Captures of the period that came from a file upload (a portable instrument's recording,
   * not the gateway), with their value of this band, oldest first.
   */
  uploads: z.array(
    z.object({
      t: z.string(),
      v: z.number(),
      q: z.enum(['ok', 'suspect', 'unusable']),
      analysisId: z.number().int(),
      /** Who uploaded the file; null when the user is gone. */
      by: z.string().nullable(),
      fileName: z.string().nullable(),
    }),
  ),
});
export type TrendResponse = z.infer<typeof trendResponseSchema>;
