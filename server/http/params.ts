import { z } from 'zod';

/** `/:id` of a resource: a PostgreSQL integer key, so larger numbers are refused here, not by the database. */
export const idParams = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });
export type IdParams = z.infer<typeof idParams>;
