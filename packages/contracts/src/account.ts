import { z } from 'zod';
import { passwordSchema } from './auth.ts';
import { unitSystemSchema } from './units.ts';

/** The user's display preferences (`GET`/`PUT /account/preferences`). */
export const preferencesSchema = z.object({ unitSystem: unitSystemSchema });
export type Preferences = z.infer<typeof preferencesSchema>;

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password.').max(1024),
  newPassword: passwordSchema,
});
export type ChangePassword = z.infer<typeof changePasswordSchema>;

export const subscriptionSchema = z
  .object({
    siteId: z.number().int().positive().nullable(),
    machineId: z.number().int().positive().nullable(),
    /** `alert` hears of alert and danger; `danger` of danger only. */
    minLevel: z.enum(['alert', 'danger']),
    /** `immediate`: at once; `hourly`: held until the top of the next hour. */
    cadence: z.enum(['immediate', 'hourly']),
  })
  .refine((s) => (s.siteId === null) !== (s.machineId === null), {
    message: 'Choose a site or a machine.',
  });
export type Subscription = z.infer<typeof subscriptionSchema>;

export const subscriptionSettingsSchema = z.object({
  items: z.array(subscriptionSchema).max(200),
  /** The Monday digest (planners). */
  weeklyDigest: z.boolean(),
});
export type SubscriptionSettings = z.infer<typeof subscriptionSettingsSchema>;

export const subscriptionSettingsResponseSchema = subscriptionSettingsSchema.extend({
  /** What the user may subscribe to: their sites and those sites' machines. */
  options: z.object({
    sites: z.array(z.object({ id: z.number().int(), code: z.string(), name: z.string() })),
    machines: z.array(
      z.object({ id: z.number().int(), siteId: z.number().int(), name: z.string() }),
    ),
  }),
});
export type SubscriptionSettingsResponse = z.infer<typeof subscriptionSettingsResponseSchema>;
