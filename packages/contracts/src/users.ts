import { z } from 'zod';
import { oneLine } from './text.ts';
import { roleSchema } from './roles.ts';
import { passwordSchema } from './auth.ts';

const email = z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254);
const name = oneLine(z.string().trim().min(1, 'Enter a name.').max(200, 'At most 200 characters.'));
const siteIds = z.array(z.number().int().positive()).max(500);

export const userSummarySchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  /** Assigned sites (admins see every site whatever is assigned). */
  siteIds: z.array(z.number().int()),
  /** Invited and not yet accepted: no password set. */
  invitePending: z.boolean(),
  disabledAt: z.string().nullable(),
  lastSignInAt: z.string().nullable(),
  createdAt: z.string(),
});
export type UserSummary = z.infer<typeof userSummarySchema>;

export const userListSchema = z.object({
  items: z.array(userSummarySchema),
  sites: z.array(z.object({ id: z.number().int(), code: z.string(), name: z.string() })),
});
export type UserList = z.infer<typeof userListSchema>;

export const inviteUserSchema = z.object({ email, name, role: roleSchema, siteIds });
export type InviteUser = z.infer<typeof inviteUserSchema>;

export const updateUserSchema = z
  .object({ role: roleSchema.optional(), siteIds: siteIds.optional(), name: name.optional() })
  .refine((v) => v.role !== undefined || v.siteIds !== undefined || v.name !== undefined, {
    message: 'Change at least one of role, sites or name.',
  });
export type UpdateUser = z.infer<typeof updateUserSchema>;

/** The token from an invite or reset link (base64url, 32 random bytes). */
export const linkTokenSchema = z.string().trim().min(20).max(200);

export const acceptInviteSchema = z.object({ token: linkTokenSchema, password: passwordSchema });
export const forgotPasswordSchema = z.object({ email });
/** Always the same answer, whether or not the address has an account. */
export const forgotPasswordResponseSchema = z.object({ accepted: z.literal(true) });
export const resetPasswordSchema = z.object({ token: linkTokenSchema, password: passwordSchema });
