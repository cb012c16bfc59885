import { z } from 'zod';
import { freeText, oneLine } from './text.ts';
import { pageCursorSchema, sinceSchema } from './paging.ts';
import { isoWeekDays } from './dates.ts';
import { labelledChoices } from './choices.ts';

/**
 * Findings: the planner's follow-ups on a point (from a trend, a forecast, an alert or a
 * data-quality notice), carried from `open` to `planned` (a work order exists) to `done`.
 */
const findingStates = labelledChoices({ open: 'Open', planned: 'Planned', done: 'Done' });
export const findingStateSchema = findingStates.schema;
export type FindingState = z.infer<typeof findingStateSchema>;
export const findingStateLabels = findingStates.labels;

const findingPriorities = labelledChoices({ high: 'High', medium: 'Medium', low: 'Low' });
export const findingPrioritySchema = findingPriorities.schema;
export type FindingPriority = z.infer<typeof findingPrioritySchema>;
export const findingPriorityLabels = findingPriorities.labels;

/** A calendar date, `YYYY-MM-DD`. */
export const isoDateSchema = z.iso.date({ message: 'Use a date like 2026-11-30' });

/**
 * An optional text or date field as forms send it: an empty string means "none" (null), so
 * the same schema serves the form and the API. `null` clears the field on an update.
 */
const blankable = <T extends z.ZodType>(schema: T) =>
  z.union([z.literal('').transform(() => null), z.null(), schema]).optional();

/**
 * A maintenance system's work-order reference as that system writes it (`WO 2026:0042`,
 * `PM-17/3 (B)`, `Auftrag Nr. 4711`): any one line of text up to 64 characters (text.ts:
 * no line breaks or control characters).
 */
export const workOrderRefSchema = oneLine(z.string().trim().max(64, 'At most 64 characters'));

const titleSchema = oneLine(
  z.string().trim().min(1, 'Give the finding a title').max(200, 'At most 200 characters'),
);
const noteSchema = freeText(z.string().trim().max(2000, 'At most 2000 characters'));
/** Who carries the work out: a person or a crew as the plant names them. */
const ownerSchema = oneLine(z.string().trim().max(100, 'At most 100 characters'));
/** Machine downtime the work needs, hours (0 to a year). */
const downtimeSchema = z
  .number({ error: 'Give the downtime in hours' })
  .finite()
  .min(0, 'At least 0 hours')
  .max(8760, 'At most 8760 hours (a year)');

/** An ISO 8601 week, `2026-W49`. */
export const isoWeekSchema = z
  .string()
  .refine((w) => isoWeekDays(w) !== null, { message: 'Use a week like 2026-W49' });

/** The planner's fields of a finding, as creating and updating one take them (all optional). */
const planningShape = {
  workOrderRef: blankable(workOrderRefSchema),
  dueDate: blankable(isoDateSchema),
  note: blankable(noteSchema),
  priority: findingPrioritySchema.optional(),
  owner: blankable(ownerSchema),
  plannedDowntimeHours: z.union([z.null(), downtimeSchema]).optional(),
};

/** `POST /api/v1/findings` */
export const createFindingSchema = z.object({
  pointId: z.number().int().positive(),
  alertId: z.number().int().positive().nullable().optional(),
  bandKey: z.string().min(1).max(64).nullable().optional(),
  title: titleSchema,
  ...planningShape,
});
export type CreateFindingInput = z.input<typeof createFindingSchema>;

/**
 * Planned downtime as a person types it: hours, a decimal point or comma (`1.5`, `1,5`);
 * empty means "none" (null). Anything else is refused with the reason, never read as 0.
 */
export const downtimeTextSchema = z
  .string()
  .trim()
  .transform((text, ctx) => {
    if (text === '') return null;
    const hours = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)$/.test(text)
      ? Number(text.replace(',', '.'))
      : Number.NaN;
    if (Number.isNaN(hours)) {
      ctx.addIssue({ code: 'custom', message: 'Give the downtime in hours, like 4 or 1.5' });
      return z.NEVER;
    }
    const checked = downtimeSchema.safeParse(hours);
    if (!checked.success) {
      for (const issue of checked.error.issues)
        ctx.addIssue({ code: 'custom', message: issue.message });
      return z.NEVER;
    }
    return checked.data;
  });

/**
 * The fields a person types into the finding form, on creating a finding and on editing one
 * (the edit sends them all as a `PATCH`; the server writes and audits what changed).
 */
export const findingFormSchema = createFindingSchema
  .pick({
    title: true,
    workOrderRef: true,
    dueDate: true,
    note: true,
    priority: true,
    owner: true,
  })
  .extend({ plannedDowntimeHours: downtimeTextSchema });
export type FindingFormInput = z.input<typeof findingFormSchema>;
export type FindingFormOutput = z.output<typeof findingFormSchema>;

/**
 * `PATCH /api/v1/findings/:id`. The state flow is open → planned → done (and back to open to
 * reopen). Moving to `planned` needs a work-order reference (given here or already on the
 * finding; 400 otherwise), and giving an open finding a work-order reference moves it to
 * `planned` unless the same request names another state. A planned finding keeps its
 * reference: clearing it answers 400. A done finding goes back to open, not to planned.
 */
export const updateFindingSchema = z
  .object({
    state: findingStateSchema.optional(),
    title: titleSchema.optional(),
    ...planningShape,
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), {
    message: 'Nothing to change',
    path: ['state'],
  });
export type UpdateFindingInput = z.input<typeof updateFindingSchema>;

/**
 * `GET /api/v1/findings?state=&dueWeek=&pointId=&siteId=&since=&cursor=&limit=`, last changed first:
 * ordered by (updatedAt, id) descending. `since` keeps findings changed (or created) at or
 * after it, so a pull with the previous pull's time gets every new and changed finding.
 */
export const findingListQuerySchema = z.object({
  state: findingStateSchema.optional(),
  /** Due in this ISO week (Monday to Sunday, `2026-W49`). */
  dueWeek: isoWeekSchema.optional(),
  pointId: z.coerce.number().int().positive().optional(),
  siteId: z.coerce.number().int().positive().optional(),
  since: sinceSchema.optional(),
  cursor: pageCursorSchema.optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(1000),
});

export const findingSchema = z.object({
  id: z.number().int(),
  pointId: z.number().int(),
  pointTag: z.string(),
  pointName: z.string(),
  machineName: z.string(),
  siteId: z.number().int(),
  siteCode: z.string(),
  alertId: z.number().int().nullable(),
  bandKey: z.string().nullable(),
  title: z.string(),
  workOrderRef: z.string().nullable(),
  dueDate: z.string().nullable(),
  state: findingStateSchema,
  priority: findingPrioritySchema,
  owner: z.string().nullable(),
  plannedDowntimeHours: z.number().nullable(),
  note: z.string().nullable(),
  createdBy: z.object({ id: z.number().int(), name: z.string() }),
  createdAt: z.string(),
  /** Last change: creation, or any field written since. */
  updatedAt: z.string(),
});
export type Finding = z.infer<typeof findingSchema>;

export const findingListSchema = z.object({ items: z.array(findingSchema) });
export type FindingList = z.infer<typeof findingListSchema>;
/** The list as the API answers it: a page with the cursor of the next (null: the last). */
export const findingPageSchema = findingListSchema.extend({ nextCursor: z.string().nullable() });
export type FindingPage = z.infer<typeof findingPageSchema>;
