import { z } from 'zod';

/** Query of every list endpoint: page from 1, sort as `column` or `-column` (descending); `count`
 * asks for the number of every matching row (and the list's totals), which the first page answers
 * unless told `count=false`. */
export const listQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.string().max(60).optional(),
  q: z.string().trim().max(200).optional(),
  count: z.stringbool().optional(),
});
export type ListQuery = z.infer<typeof listQuerySchema>;
/** A list's answer. `total` counts every matching row unless `totalExact` is false: then it is a
 * lower bound (the rows up to the page's end, plus one when more follow), as pages after the first
 * answer without a count. Lists with totals send them with a count. */
export type ListResponse<T> = { data: T[]; total: number; totalExact?: boolean };
