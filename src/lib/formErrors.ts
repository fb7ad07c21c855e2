import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from './api';

/** Puts the server's field messages on the form's fields; answers whether any were placed. */
export function showServerFieldErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>): boolean {
  if (!(error instanceof ApiError)) return false;
  const fields = Object.entries(error.fieldErrors()).filter(([path]) => path);
  for (const [path, message] of fields) setError(path as Path<T>, { type: 'server', message });
  return fields.length > 0;
}
