import { z } from 'zod';

/** Query of every list endpoint: page from 1, sort as `column` or `-column` (descending). */
export const listQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.string().max(60).optional(),
  q: z.string().trim().max(200).optional(),
});
export type ListQuery = z.infer<typeof listQuerySchema>;
export type ListResponse<T> = { data: T[]; total: number };
