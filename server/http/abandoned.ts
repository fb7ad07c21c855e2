// Reads nobody waits for any more stop at once. When the client of a GET leaves before its answer is
// sent, the statements the request is running are cancelled in PostgreSQL and it may start no more
// (its transaction still rolls back). Changes run to their end: a change completes or fails as a
// whole whether or not its client stays to hear which. Every statement is bounded besides by
// STATEMENT_TIMEOUT_SECONDS (db/index.ts).
import { AsyncLocalStorage } from 'node:async_hooks';
import type { RequestHandler } from 'express';
import pg from 'pg';
import { sequelize } from '../../db';
import { config } from '../config';
import { logger } from '../logger';
import { AppError } from './errors';

/** A statement in flight, as Sequelize runs it: its text once sent, on a connection of the pool. */
type Statement = { sql?: string; connection: { processID?: number } };
type RequestWork = { abandoned: boolean; running: Set<Statement> };

const requests = new AsyncLocalStorage<RequestWork>();

const HOOK = 'abandoned-requests';
sequelize.addHook('beforeQuery', HOOK, (options, query) => {
  const work = requests.getStore();
  if (!work) return;
  // Ending a transaction still runs, so that its connection goes back to the pool clean.
  if (work.abandoned && !(options as { completesTransaction?: boolean }).completesTransaction) {
    throw new AppError(503, 'abandoned', 'The client left before the answer was ready');
  }
  work.running.add(query as unknown as Statement);
});
sequelize.addHook('afterQuery', HOOK, (_options, query) => {
  requests.getStore()?.running.delete(query as unknown as Statement);
});

// A connection of its own, outside the pool the cancelled statements may be holding all of.
let canceller: pg.Pool | undefined;

/** Cancels each statement if its connection is still running it (not a later one of another request). */
async function cancel(statements: Statement[]) {
  canceller ??= new pg.Pool({ connectionString: config.DATABASE_URL, max: 1, idleTimeoutMillis: 10_000, allowExitOnIdle: true });
  for (const { sql, connection } of statements) {
    if (!sql || !connection.processID) continue;
    // pg_stat_activity keeps the first track_activity_query_size bytes of the text.
    await canceller.query(
      `SELECT pg_cancel_backend(pid) FROM pg_stat_activity WHERE pid = $1 AND state = 'active' AND query <> '' AND starts_with($2, query)`,
      [connection.processID, sql],
    );
  }
}

/** Middleware: watches GET and HEAD requests for a client that leaves before the answer. */
export const stopWhenAbandoned: RequestHandler = (req, res, next) => {
  if (req.method !== 'GET' && req.method !== 'HEAD') return next();
  const work: RequestWork = { abandoned: false, running: new Set() };
  res.once('close', () => {
    if (res.writableFinished) return;
    work.abandoned = true;
    if (work.running.size === 0) return;
    const statements = [...work.running];
    cancel(statements).then(
      () => logger.info({ requestId: req.id, statements: statements.length }, 'client left: statements cancelled'),
      (err) => logger.warn({ err, requestId: req.id }, 'client left: could not cancel its statements'),
    );
  });
  requests.run(work, next);
};
