import { z } from 'zod';
import { currentDiagnosisSchema, isoZoneSchema } from './points.ts';
import { freeText } from './text.ts';
import { pageCursorSchema, sinceSchema } from './paging.ts';
import { bandRefShape, pointRefShape } from './point-ref.ts';

/** Alerts of the limit evaluation: level, lifecycle, and the Alerts screen's requests. */

export const alertLevelSchema = z.enum(['alert', 'danger']);
export const alertStateSchema = z.enum(['raised', 'acknowledged', 'cleared']);
export type AlertLevelName = z.infer<typeof alertLevelSchema>;
export type AlertStateName = z.infer<typeof alertStateSchema>;

/**
 * `GET /api/v1/alerts?state=&siteId=&pointId=&level=&since=&cursor=&limit=`, newest activity
 * first: ordered by (lastAt, id) descending. `since` keeps alerts whose lastAt (raised, or
 * the latest value while open) is at or after it.
 */
export const alertListQuerySchema = z.object({
  state: alertStateSchema.optional(),
  level: alertLevelSchema.optional(),
  siteId: z.coerce.number().int().positive().optional(),
  pointId: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(500),
  since: sinceSchema.optional(),
  cursor: pageCursorSchema.optional(),
});
export type AlertListQuery = z.input<typeof alertListQuerySchema>;

export const alertSchema = z.object({
  id: z.number().int(),
  level: alertLevelSchema,
  state: alertStateSchema,
  ...pointRefShape,
  ...bandRefShape,
  /** Latest value while open. */
  value: z.number(),
  peakValue: z.number(),
  /** The level exceeded (after escalation: the danger level). */
  limit: z.number(),
  suspect: z.boolean(),
  firstAt: z.string(),
  lastAt: z.string(),
  clearedAt: z.string().nullable(),
  acknowledgedBy: z.string().nullable(),
  acknowledgedAt: z.string().nullable(),
  acknowledgeNote: z.string().nullable(),
  /** Last change of any kind (a new value, escalation, acknowledgement, clearing). */
  updatedAt: z.string(),
});
export type Alert = z.infer<typeof alertSchema>;

export const alertListSchema = z.object({ items: z.array(alertSchema) });
export type AlertList = z.infer<typeof alertListSchema>;
/** The list as the API answers it: a page with the cursor of the next (null: the last). */
export const alertPageSchema = alertListSchema.extend({ nextCursor: z.string().nullable() });
export type AlertPage = z.infer<typeof alertPageSchema>;

export const alertEventSchema = z.object({
  id: z.number().int(),
  kind: z.enum(['raised', 'escalated', 'acknowledged', 'cleared']),
  level: alertLevelSchema,
  value: z.number().nullable(),
  at: z.string(),
  userName: z.string().nullable(),
  note: z.string().nullable(),
});
export type AlertEvent = z.infer<typeof alertEventSchema>;

/**
 * How an open alert of this band clears, from the point's limit set in force (levels as the
 * worker judges: statistical once the baseline is complete).
 */
export const alertClearRuleSchema = z.object({
  /** The alert level in force, in the alert's unit. */
  alertLevel: z.number(),
  /** The danger level in force. */
  dangerLevel: z.number(),
  /** Values strictly below it count towards clearing (hysteresis × the alert level). */
  clearLevel: z.number(),
  /** Consecutive values below the clear level needed to clear. */
  clearPersistence: z.number().int(),
  /** Off-delay, hours: the raise rule must not have held for this long (0: none). */
  clearAfterHours: z.number(),
});
export type AlertClearRule = z.infer<typeof alertClearRuleSchema>;

/** `GET /api/v1/alerts/:id` */
export const alertDetailSchema = alertSchema.extend({
  /** Null when the point's limit set no longer has the band. */
  clearRule: alertClearRuleSchema.nullable(),
  /** What the band measures, one plain sentence; null when the limit set no longer has it. */
  bandMeaning: z.string().nullable(),
  /** The machine's ISO 20816 zone: the worst zone of its points' newest zoned captures. */
  machineZone: isoZoneSchema.nullable(),
  /** Values of the band taken after the one that raised the alert; null once cleared. */
  valuesSinceRaised: z.number().int().nullable(),
  /** The band's newest values, oldest first (the detail's sparkline). */
  recentValues: z.array(z.object({ at: z.string(), value: z.number() })),
  history: z.array(alertEventSchema),
  /** Diagnosis hints of the point's newest capture; null when it has none stored. */
  currentDiagnosis: currentDiagnosisSchema.nullable(),
});
export type AlertDetail = z.infer<typeof alertDetailSchema>;

export const acknowledgeNoteSchema = freeText(
  z
    .string()
    .trim()
    .min(2, 'Write a short note (what you saw or did).')
    .max(1000, 'Keep the note under 1000 characters.'),
);

/** `POST /api/v1/alerts/:id/acknowledge` */
export const acknowledgeRequestSchema = z.object({ note: acknowledgeNoteSchema });
export type AcknowledgeRequest = z.infer<typeof acknowledgeRequestSchema>;

/** `POST /api/v1/alerts/acknowledge`: several at once, all or nothing. */
export const acknowledgeManyRequestSchema = z.object({
  ids: z.array(z.number().int().positive()).min(1, 'Select at least one alert.').max(200),
  note: acknowledgeNoteSchema,
});
export type AcknowledgeManyRequest = z.infer<typeof acknowledgeManyRequestSchema>;

export const acknowledgeResponseSchema = z.object({ items: z.array(alertSchema) });

/** `GET /api/v1/alerts/:id/from-mail`: the signature the alert mail's link carries. */
export const alertMailLinkQuerySchema = z.object({
  sig: z.string().trim().min(1, 'The link has no signature.').max(100),
});
