// Server-side lists: one SQL definition per list gives the JSON page (`{data, total, totalExact,
// totals}`) and the CSV of everything the same filter shows. Only whitelisted columns sort; search is
// ILIKE over named expressions; filters arrive as SQL clauses with their replacements. Counting every
// matching row (and summing the totals) costs as much as reading them all, so it is done for the
// first page or when the client asks (`count=true`); other pages read one row past their end and
// answer a lower bound (`totalExact: false`), which is all a pager needs to offer the next page.
import type { Response, Router } from 'express';
import { QueryTypes } from 'sequelize';
import type { z } from 'zod';
import { sequelize } from '../../db';
import type { Permission } from '../../shared/policies';
import type { ListQuery } from '../../shared/schemas/paging';
import { allow, authenticate } from '../auth/authenticate';
import { sendCsv, type CsvColumn } from './csv';
import { badRequest } from './errors';
import { sendUnchangedAnswer } from './unchangedAnswers';
import { validated } from './validate';

export type Filters = { clauses: string[]; replacements: Record<string, unknown> };

export type ListDefinition<Row, Query extends ListQuery = ListQuery> = {
  /** SELECT list naming each output column in camelCase ("AS \"receivedAt\""). */
  select: string;
  /** FROM with its JOINs. */
  from: string;
  /** Work per row that no filter needs (counts over a lot's pieces, say), done for the rows of a page
   * only, once it is cut: output columns (`select`) and the joins that give them (`from`), written
   * against the row's own output columns as `page."column"`. A sort by one of its columns (`sortable`,
   * naming `from`'s aliases) and the totals have it done for every matching row. */
  late?: { select: string; from: string; sortable?: Record<string, string> };
  /** Sort keys the client may send, each with the SQL it orders by. */
  sortable: Record<string, string>;
  /** Sort keys whose SQL is never NULL: ordered without NULLS LAST, so that one ordinary index
   * serves both directions (nullable keys put their NULLs last either way). */
  notNull?: readonly string[];
  defaultSort: string;
  /** A unique expression that makes every order total, so pages never overlap. */
  tieBreaker: string;
  /** Expressions matched with ILIKE against `%q%`; an entry that names :q itself is a whole condition. */
  search: string[];
  /** Sums over every row the filter matches, in terms of the output columns. */
  totals?: Record<string, string>;
  filters?: (query: Query) => Filters;
  present: (row: Record<string, unknown>) => Row;
  csv: { filename: string; columns: CsvColumn<Row>[] };
};

/** Adds `clause` with its replacement when the value is given. */
export function filterWhen(filters: Filters, value: unknown, clause: string, name: string) {
  if (value === undefined || value === null || value === '') return filters;
  filters.clauses.push(clause);
  filters.replacements[name] = value;
  return filters;
}

const escapeLike = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

/** `%text%` for ILIKE, with the text's own % and _ taken literally. */
export const containing = (text: string) => `%${escapeLike(text)}%`;

/** The SQL a sort key (`column` or `-column`) orders by, and its direction; 400 for a key not in
 * `sortable`. Own keys only: "__proto__" or "constructor" must not find Object's members. */
export function sortOf(sortable: Record<string, string>, requested: string) {
  const key = requested.replace(/^-/, '');
  const expression = Object.hasOwn(sortable, key) ? sortable[key] : undefined;
  if (!expression) throw badRequest(`Cannot sort by "${key}"; sort by one of: ${Object.keys(sortable).join(', ')}`);
  return { expression, direction: requested.startsWith('-') ? 'DESC' : 'ASC' };
}

/** The SQL of a stretch of the list in its order (`LIMIT :limit OFFSET :offset`), and of all its
 * rows (what totals are summed over), with their replacements. */
function listSql<Row, Query extends ListQuery>(definition: ListDefinition<Row, Query>, query: Query) {
  const requested = query.sort || definition.defaultSort;
  const key = requested.replace(/^-/, '');
  const lateSortable = definition.late?.sortable ?? {};
  const { expression, direction } = sortOf({ ...definition.sortable, ...lateSortable }, requested);
  const nulls = definition.notNull?.includes(key) ? '' : ' NULLS LAST';
  const filters = definition.filters?.(query) ?? { clauses: [], replacements: {} };
  const clauses = [...filters.clauses];
  const replacements: Record<string, unknown> = { ...filters.replacements };
  if (query.q && definition.search.length) {
    clauses.push(`(${definition.search.map((term) => (term.includes(':q') ? term : `${term} ILIKE :q`)).join(' OR ')})`);
    replacements.q = containing(query.q);
  }
  const where = clauses.length ? `WHERE ${clauses.join(' AND ')}` : '';
  const rows = (extra = '') => `SELECT ${definition.select}${extra} FROM ${definition.from} ${where}`;
  const { late, tieBreaker } = definition;
  if (!late) {
    const all = rows();
    return { stretch: `${all} ORDER BY ${expression} ${direction}${nulls}, ${tieBreaker} ${direction} LIMIT :limit OFFSET :offset`, all, replacements };
  }
  const withLate = (page: string) => `SELECT page.*, ${late.select} FROM (${page}) page ${late.from}`;
  const all = withLate(rows(`, ${tieBreaker} AS "__tie"`));
  if (Object.hasOwn(lateSortable, key)) {
    return { stretch: `${all} ORDER BY ${expression} ${direction}${nulls}, page."__tie" ${direction} LIMIT :limit OFFSET :offset`, all, replacements };
  }
  // The stretch is cut from the rows alone, in an order an index may give; the late work joins it.
  const cut = `${rows(`, ${expression} AS "__sort", ${tieBreaker} AS "__tie"`)} ORDER BY ${expression} ${direction}${nulls}, ${tieBreaker} ${direction} LIMIT :limit OFFSET :offset`;
  return { stretch: `${withLate(cut)} ORDER BY page."__sort" ${direction}${nulls}, page."__tie" ${direction}`, all, replacements };
}

/** A page of a list: `total` is the number of matching rows when `totalExact`, otherwise at least
 * that many (the rows up to this page's end, plus one when more follow). `totals` come with a count. */
export type ListPage<Row> = { data: Row[]; total: number; totalExact: boolean; totals?: Record<string, number> };

/** Whether a page is answered with a count of every matching row. */
const counts = (query: ListQuery) => query.count ?? query.page === 1;

/** The page from `rows` read one past its end, when no count is needed: past the last row (a
 * bookmark to a page that is no longer there), or asked for, the caller counts instead (null). */
export function uncountedPage<Row>(rows: Row[], query: ListQuery): ListPage<Row> | null {
  const offset = (query.page - 1) * query.pageSize;
  if (counts(query) || (rows.length === 0 && offset > 0)) return null;
  const more = rows.length > query.pageSize;
  return { data: rows.slice(0, query.pageSize), total: offset + Math.min(rows.length, query.pageSize) + (more ? 1 : 0), totalExact: !more };
}

export async function listPage<Row, Query extends ListQuery>(definition: ListDefinition<Row, Query>, query: Query): Promise<ListPage<Row>> {
  const { stretch, all, replacements } = listSql(definition, query);
  const rows = await sequelize.query<Record<string, unknown>>(stretch, {
    type: QueryTypes.SELECT,
    replacements: { ...replacements, limit: query.pageSize + 1, offset: (query.page - 1) * query.pageSize },
  });
  const presented = rows.map(definition.present);
  const page = uncountedPage(presented, query);
  if (page) return page;
  const totalColumns = Object.entries(definition.totals ?? {})
    .map(([name, expression]) => `, ${expression} AS "${name}"`)
    .join('');
  const [summary] = await sequelize.query<Record<string, string | null>>(`SELECT count(*) AS total${totalColumns} FROM (${all}) AS listed`, {
    type: QueryTypes.SELECT,
    replacements,
  });
  const totals = Object.fromEntries(Object.keys(definition.totals ?? {}).map((name) => [name, Number(summary[name] ?? 0)]));
  return { data: presented.slice(0, query.pageSize), total: Number(summary.total), totalExact: true, totals };
}

/** Every row the filter matches, in the list's order, read in batches. The query is checked at
 * once (a bad sort fails before any CSV is sent); rows are read as they are consumed. */
export function listAll<Row, Query extends ListQuery>(definition: ListDefinition<Row, Query>, query: Query, batchSize = 1000): AsyncGenerator<Row> {
  const { stretch, replacements } = listSql(definition, query);
  return (async function* () {
    for (let offset = 0; ; offset += batchSize) {
      const rows = await sequelize.query<Record<string, unknown>>(stretch, {
        type: QueryTypes.SELECT,
        replacements: { ...replacements, limit: batchSize, offset },
      });
      for (const row of rows) yield definition.present(row);
      if (rows.length < batchSize) return;
    }
  })();
}

/** Mounts `path` (JSON, or CSV with `?format=csv`) and `path/export.csv` for one list. */
export function mountList<Row, Schema extends z.ZodType<ListQuery>>(
  router: Router,
  path: string,
  permission: Permission,
  querySchema: Schema,
  definition: ListDefinition<Row, z.infer<Schema>>,
) {
  const csv = (query: z.infer<Schema>, res: Response) =>
    sendCsv(res, `${definition.csv.filename}-${new Date().toISOString().slice(0, 10)}.csv`, definition.csv.columns, listAll(definition, query));
  router.get(
    `${path === '/' ? '' : path}/export.csv`,
    authenticate,
    allow(permission),
    validated({ query: querySchema }, ({ query }, _req, res) => csv(query, res)),
  );
  router.get(
    path,
    authenticate,
    allow(permission),
    validated({ query: querySchema }, async ({ query }, req, res) => {
      if (req.query.format === 'csv') return csv(query, res);
      await sendUnchangedAnswer(req, res, `${definition.csv.filename} ${JSON.stringify(query)}`, () => listPage(definition, query));
    }),
  );
}
