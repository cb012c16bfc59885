import { z } from 'zod';

/**
 * Paging of the lists an integrator pulls (alerts, findings): a page answers `nextCursor`,
 * null on the last page; pass it back as `cursor` with the same filters for the next one.
 * The cursor is opaque (base64url, at most 64 characters) and positions by (time, id), so a
 * page stays correct while new rows arrive.
 */
export const pageCursorSchema = z
  .string()
  .max(64, 'cursor is the nextCursor of the previous page')
  .regex(/^[A-Za-z0-9_-]+$/, 'cursor is the nextCursor of the previous page');

/** `since`: only rows whose time (as each list says) is at or after this instant. */
export const sinceSchema = z.iso.datetime({ offset: true });
