import { z } from 'zod';
import { roleSchema } from './roles.ts';
import { unitSystemSchema } from './units.ts';

/**
 * Password rule: 8..64 characters and at most 72 UTF-8 bytes, because bcrypt ignores
 * everything past byte 72 and we refuse rather than silently cut (OWASP ASVS 5.0 6.2.x).
 */
export const passwordSchema = z
  .string()
  .min(8, 'Password must be at least 8 characters.')
  .max(64, 'Password must be at most 64 characters.')
  .refine((p) => new TextEncoder().encode(p).length <= 72, {
    message: 'Password is longer than 72 bytes in UTF-8; choose a shorter one.',
  });

export const signInRequestSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(1024),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const meSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  siteIds: z.array(z.number().int()),
  /** Metric (mm/s, µm) or imperial (in/s, mil): how every screen shows values to this user. */
  unitSystem: unitSystemSchema,
  /**
   * The IANA time zone of every time on screens not tied to one site (alerts, fleet, audit,
   * mailbox, findings): the zone of the user's sites when they all share one, otherwise UTC.
   * The screens name it (the page footer); screens of one site use that site's zone.
   */
  timeZone: z.string(),
});
export type Me = z.infer<typeof meSchema>;

export const signInResponseSchema = z.object({ user: meSchema });

/**
 * `GET /api/v1/auth/session`: the signed-in user, or null. Always 200, so a page's first
 * question ("is anyone signed in?") is not an error in the browser's console.
 */
export const sessionResponseSchema = z.object({ user: meSchema.nullable() });
export type SessionResponse = z.infer<typeof sessionResponseSchema>;
export type SignInResponse = z.infer<typeof signInResponseSchema>;
