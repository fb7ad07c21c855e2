import { z } from 'zod';

/** `/:id` of a resource. */
export const idParams = z.object({ id: z.coerce.number().int().positive() });
export type IdParams = z.infer<typeof idParams>;
