'use client';

import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiClientError } from '@/lib/api/client';

/** Copy an API answer's field errors onto the form; returns the general message to show. */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, known: readonly Path<T>[]): string {
  if (err instanceof ApiClientError) {
    for (const [field, messages] of Object.entries(err.fields ?? {})) {
      if ((known as readonly string[]).includes(field)) setError(field as Path<T>, { message: messages[0] });
    }
    return err.message;
  }
  return 'The server could not be reached. Try again.';
}
