// Pages of the server's lists. Counting every matching row (and summing a list's totals) is the
// costly part of a list on a large site, so the server does it only when asked: a filter's count is
// asked with the first page shown, kept under a key of its own (the list's key with the filter, page
// and sort aside), and merged into every later page of that filter, so a page always has its total.
import type { QueryFunction, QueryKey } from '@tanstack/react-query';
import type { ListResponse } from '@shared/schemas/paging';
import { api } from './api';

export type Listed<T> = ListResponse<T> & { totals: Record<string, number> };
type Count = Pick<Listed<unknown>, 'total' | 'totals'>;
type ListQuery = Record<string, string | number | undefined>;

/** A count older than this is asked again with the next page. */
const COUNT_FRESH_MS = 60_000;

const countKey = (pageKey: QueryKey, { page: _page, pageSize: _pageSize, sort: _sort, ...filter }: ListQuery): QueryKey => [
  ...pageKey.slice(0, -1),
  'count',
  filter,
];

/** The query function of one page of the list at `path`; its query key must end with `query`. */
export function listPage<T>(path: string, query: ListQuery): QueryFunction<Listed<T>> {
  return async ({ client, queryKey, signal }) => {
    const key = countKey(queryKey, query);
    const known = client.getQueryState<Count>(key);
    const count = known?.data && !known.isInvalidated && Date.now() - known.dataUpdatedAt < COUNT_FRESH_MS ? known.data : undefined;
    const page = await api<ListResponse<T> & { totals?: Record<string, number> }>(path, { query: { ...query, count: !count }, signal });
    // The server sends totals exactly when it counted.
    if (page.totals) {
      client.setQueryData<Count>(key, { total: page.total, totals: page.totals });
      return { ...page, totals: page.totals };
    }
    if (!count) throw new Error(`${path} answered without the count it was asked for`);
    // Rows added since the count may show more than it says.
    return { ...page, total: Math.max(count.total, page.total), totalExact: page.total <= count.total, totals: count.totals };
  };
}
