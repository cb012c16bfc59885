/**
 * Single-use links in mail (invite, password reset) and how their tokens are hidden once the
 * message is stored or shown to someone else.
 */

/** Kinds of mail that carry a single-use sign-in link (a password can be set with it). */
export const LINK_TOKEN_KINDS = ['invite', 'reset'] as const;

/** The token of a link in mail text or HTML (`#token=…`, or `?token=` / `&token=`). */
const TOKEN_IN_LINK = /([#?&]token=)[A-Za-z0-9_-]+/g;
/** The same pattern for MariaDB's REGEXP_REPLACE (PCRE), replacing with `\1hidden`. */
export const TOKEN_IN_LINK_SQL = '([#?&]token=)[A-Za-z0-9_-]+';

/** The text with every link token replaced by "hidden": the link no longer works. */
export function maskLinkTokens(text: string): string;
export function maskLinkTokens(text: string | null): string | null;
export function maskLinkTokens(text: string | null): string | null {
  return text === null ? null : text.replace(TOKEN_IN_LINK, '$1hidden');
}
