/**
 * The one encoding of the opaque page cursors (contracts/paging.ts): the (time, id) of the
 * last row of a page, as base64url of `<epoch ms>.<id>`. A cursor that does not decode to
 * that is a 400 `invalid_cursor`, never a 500.
 */
import { and, eq, lt, or, type SQL } from 'drizzle-orm';
import type { MySqlColumn } from 'drizzle-orm/mysql-core';
import { AppError } from './app-error.ts';

export interface CursorPosition {
  at: Date;
  id: number;
}

export const encodeCursor = (p: CursorPosition) =>
  Buffer.from(`${p.at.getTime()}.${p.id}`).toString('base64url');

const invalid = () =>
  new AppError('invalid_cursor', 'cursor is not the nextCursor of a previous page.', 400, [
    { path: 'cursor', message: 'not a cursor this server issued' },
  ]);

export function decodeCursor(cursor: string): CursorPosition {
  const m = /^(\d{1,15})\.(\d{1,15})$/.exec(Buffer.from(cursor, 'base64url').toString('latin1'));
  if (!m) throw invalid();
  const at = new Date(Number(m[1]));
  const id = Number(m[2]);
  if (Number.isNaN(at.getTime()) || !Number.isSafeInteger(id)) throw invalid();
  return { at, id };
}

/** The page of `rows` (fetched `limit + 1`) and the cursor after it (null when last). */
export function pageOf<T>(rows: T[], limit: number, position: (row: T) => CursorPosition) {
  const items = rows.slice(0, limit);
  return {
    items,
    nextCursor: rows.length > limit ? encodeCursor(position(items[items.length - 1]!)) : null,
  };
}

/** Rows after a cursor position in the order (time, id) descending: the keyset condition. */
export function afterPosition(time: MySqlColumn, id: MySqlColumn, p: CursorPosition): SQL {
  return or(lt(time, p.at), and(eq(time, p.at), lt(id, p.id)))!;
}
