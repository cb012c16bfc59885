import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from '../../../lib/api-client.ts';

/**
 * Puts the server's field errors (400 `validation_failed`, 409 conflicts, both with
 * `details: [{ path: 'bearings.0.name', message }]`) onto the form's fields. Returns the
 * message to show above the form when none of them names a field the form has.
 */
export function applyServerErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fields: readonly string[],
): string | null {
  if (!isApiError(error)) return error instanceof Error ? error.message : 'Could not save.';
  const details = Array.isArray(error.details) ? (error.details as unknown[]) : [];
  let placed = false;
  for (const d of details) {
    const raw = (d as { path?: unknown }).path;
    const path = Array.isArray(raw) ? raw.join('.') : typeof raw === 'string' ? raw : '';
    const message = (d as { message?: unknown }).message;
    if (!path || typeof message !== 'string') continue;
    if (!fields.some((f) => path === f || path.startsWith(`${f}.`))) continue;
    setError(path as Path<T>, { type: 'server', message }, { shouldFocus: !placed });
    placed = true;
  }
  return placed ? null : error.message;
}
