import { useState } from 'react';
import { fieldErrorsOf } from '../lib/api-client.ts';

/**
 * A plain form's save and what the server said of it: `save(promise, ok)` clears the last
 * errors, runs `ok` with the result, or puts the server's field errors in `errors` (by field
 * name) and any other failure in `formError`.
 */
export function useSaveErrors() {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const save = <T>(saving: Promise<T>, ok: (result: T) => void) => {
    setErrors({});
    setFormError(null);
    saving.then(ok, (err: Error) => {
      const fields = fieldErrorsOf(err);
      setErrors(fields);
      if (Object.keys(fields).length === 0) setFormError(err.message);
    });
  };
  return { errors, formError, save };
}
