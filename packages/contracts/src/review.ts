import { z } from 'zod';
import { findingSchema, isoDateSchema } from './findings.ts';
import { bandRefShape, pointRefShape } from './point-ref.ts';

/**
 * The planner's weekly review: this week against last. A week is the seven local days of each
 * site (its IANA time zone) ending with `weekEnding` (inclusive); last week is the seven days
 * before it.
 *
 * `GET /api/v1/review?weekEnding=YYYY-MM-DD&weeksAhead=4&siteId=&minChangePercent=&minValues=`
 * (JSON) and `GET /api/v1/review.zip?…` (one CSV file per table).
 */
/** The forecast horizon a review is built for when none is asked (weeks). */
export const WEEKS_AHEAD_DEFAULT = 4;

export const reviewQuerySchema = z.object({
  /** Last day of the week reviewed; default today (UTC). */
  weekEnding: isoDateSchema.optional(),
  /** Forecast horizon: points projected to reach a level within this many weeks. */
  weeksAhead: z.coerce.number().int().min(1).max(52).default(WEEKS_AHEAD_DEFAULT),
  /** One site only; default every site the user may see. */
  siteId: z.coerce.number().int().positive().optional(),
  /** Noise threshold: a rise counts only when this week's mean is this many % above last week's. */
  minChangePercent: z.coerce.number().min(0).max(1000).default(5),
  /** Noise threshold: … and each of the two weeks has at least this many values. */
  minValues: z.coerce.number().int().min(1).max(10_000).default(3),
});
export type ReviewQuery = z.input<typeof reviewQuerySchema>;

/** Choices the screen offers for the forecast horizon. */
export const WEEKS_AHEAD_CHOICES = [2, 4, 8, 12, 26] as const;

/** A point with the names a row of the review shows (the server reads it so). */
export type PointRef = z.infer<z.ZodObject<typeof pointRefShape>>;

/** One point and band whose weekly mean rose. */
export const reviewMoverSchema = z.object({
  ...pointRefShape,
  ...bandRefShape,
  lastWeekMean: z.number(),
  thisWeekMean: z.number(),
  lastWeekCount: z.number().int(),
  thisWeekCount: z.number().int(),
  /** thisWeekMean − lastWeekMean, in `unit`. */
  change: z.number(),
  /** 100 · change / lastWeekMean; null when last week's mean is 0. */
  changePercent: z.number().nullable(),
});
export type ReviewMover = z.infer<typeof reviewMoverSchema>;

/** One point and band projected to reach its next level within the horizon. */
export const reviewForecastSchema = z.object({
  ...pointRefShape,
  ...bandRefShape,
  latestValue: z.number(),
  latestAt: z.string(),
  target: z.object({ level: z.enum(['alert', 'danger']), value: z.number() }),
  /** Whether the target is the fixed level or a statistical (baseline) one. */
  levelSource: z.enum(['fixed', 'statistical']),
  crossingAt: z.string(),
  /** Whole days from the end of the week reviewed to the crossing (0: due now). */
  daysToCrossing: z.number(),
  model: z.enum(['linear', 'exponential']),
  r2: z.number(),
  /** Daily means the fit went through. */
  points: z.number().int(),
});
export type ReviewForecast = z.infer<typeof reviewForecastSchema>;

export const reviewAlertSchema = z.object({
  ...pointRefShape,
  alertId: z.number().int(),
  ...bandRefShape,
  level: z.enum(['alert', 'danger']),
  state: z.enum(['raised', 'acknowledged']),
  limitValue: z.number(),
  lastValue: z.number(),
  peakValue: z.number(),
  firstAt: z.string(),
  lastAt: z.string(),
  /** Whole days since the alert was first raised, at the time of the review. */
  ageDays: z.number().int(),
  suspect: z.boolean(),
});
export type ReviewAlert = z.infer<typeof reviewAlertSchema>;

export const qualityFindingSchema = z.object({
  code: z.string(),
  severity: z.string(),
  message: z.string(),
  value: z.number().nullable().optional(),
});

export const reviewQualityNoticeSchema = z.object({
  ...pointRefShape,
  noticeId: z.number().int(),
  snapshotId: z.number().int().nullable(),
  verdict: z.enum(['ok', 'suspect', 'unusable']),
  takenAt: z.string(),
  findings: z.array(qualityFindingSchema),
});
export type ReviewQualityNotice = z.infer<typeof reviewQualityNoticeSchema>;

/** A machine with rising bands: the review's groups, worst machine first. */
export const reviewMachineGroupSchema = z.object({
  machineId: z.number().int(),
  machineName: z.string(),
  siteCode: z.string(),
  criticality: z.enum(['high', 'medium', 'low']),
  /** Rising bands of the machine (rows in `movers`, worst first). */
  movers: z.number().int(),
  /** The largest percentage rise of its bands (null: a band rose from zero). */
  worstChangePercent: z.number().nullable(),
});
export type ReviewMachineGroup = z.infer<typeof reviewMachineGroupSchema>;

export const reviewFindingDueSchema = findingSchema.extend({
  /** Not done and due before the day the review was made. */
  overdue: z.boolean(),
});
export type ReviewFindingDue = z.infer<typeof reviewFindingDueSchema>;

export const reviewSchema = z.object({
  period: z.object({
    weekEnding: z.string(),
    /** ISO instants; `to` is exclusive. */
    thisWeek: z.object({ from: z.string(), to: z.string() }),
    lastWeek: z.object({ from: z.string(), to: z.string() }),
    weeksAhead: z.number().int(),
    /** The sites' time zone when they share one, else "per site" (see `siteWeeks`). */
    timeZone: z.string(),
    generatedAt: z.string(),
  }),
  /** Each site's weeks in its own time zone (ISO instants; `to` exclusive). */
  siteWeeks: z.array(
    z.object({
      siteId: z.number().int(),
      siteCode: z.string(),
      timeZone: z.string(),
      thisWeek: z.object({ from: z.string(), to: z.string() }),
      lastWeek: z.object({ from: z.string(), to: z.string() }),
    }),
  ),
  /** The noise threshold the movers passed: both stated on the screen and in the files. */
  noise: z.object({ minChangePercent: z.number(), minValues: z.number().int() }),
  sites: z.array(
    z.object({ id: z.number().int(), code: z.string(), name: z.string(), timeZone: z.string() }),
  ),
  summary: z.object({
    movers: z.number().int(),
    forecasts: z.number().int(),
    openAlerts: z.number().int(),
    openDanger: z.number().int(),
    unacknowledged: z.number().int(),
    qualityNotices: z.number().int(),
    findingsDue: z.number().int(),
    findingsOverdue: z.number().int(),
    findingsCreated: z.number().int(),
    /** Rises the noise threshold left out. */
    moversBelowThreshold: z.number().int(),
  }),
  machineGroups: z.array(reviewMachineGroupSchema),
  /** Ordered by machine group (criticality, then change), worst band first within it. */
  movers: z.array(reviewMoverSchema),
  forecasts: z.array(reviewForecastSchema),
  openAlerts: z.array(reviewAlertSchema),
  qualityNotices: z.array(reviewQualityNoticeSchema),
  findingsDue: z.array(reviewFindingDueSchema),
  /** Findings created within this week (each site's own week). */
  findingsCreated: z.array(findingSchema),
});
export type WeeklyReview = z.infer<typeof reviewSchema>;
