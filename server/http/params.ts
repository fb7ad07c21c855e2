import { z } from 'zod';

/**
 * One id in a path: digits only ("1e3", "1.5" or " 7" name nothing) and a PostgreSQL integer key, so
 * larger numbers are refused here, not by the database.
 */
export const idParam = z
  .string()
  .regex(/^[1-9][0-9]{0,9}$/, 'An id is a whole number from 1, written in digits')
  .transform(Number)
  .pipe(z.number().max(2_147_483_647, 'No record has an id this large'));

/** `/:id` of a resource. */
export const idParams = z.object({ id: idParam });
export type IdParams = z.infer<typeof idParams>;
