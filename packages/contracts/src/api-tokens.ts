import { z } from 'zod';
import { oneLine } from './text.ts';
import { roleSchema } from './roles.ts';

/**
 * API tokens of service accounts (a maintenance-management system, a historian): issued by
 * an administrator with a role and sites, sent as `Authorization: Bearer <token>` on
 * `/api/v1`. The token is shown once, when issued; the server keeps only its SHA-256.
 */
export const apiTokenSchema = z.object({
  id: z.number().int(),
  /** The service account the token acts as (its id appears as the actor in the audit log). */
  userId: z.number().int(),
  name: z.string(),
  role: roleSchema,
  siteIds: z.array(z.number().int()),
  /** First characters of the token, to tell tokens apart; never the token. */
  tokenPrefix: z.string(),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;

export const apiTokenListSchema = z.object({ items: z.array(apiTokenSchema) });
export type ApiTokenList = z.infer<typeof apiTokenListSchema>;

/** `POST /api/v1/api-tokens` */
export const issueApiTokenSchema = z.object({
  name: oneLine(
    z.string().trim().min(1, 'Name the integration.').max(200, 'At most 200 characters.'),
  ),
  role: roleSchema,
  siteIds: z.array(z.number().int().positive()).max(500),
});
export type IssueApiToken = z.infer<typeof issueApiTokenSchema>;

/** The answer to issuing: the token itself, this once. */
export const issuedApiTokenSchema = apiTokenSchema.extend({ token: z.string() });
export type IssuedApiToken = z.infer<typeof issuedApiTokenSchema>;
