// One Sequelize instance for the process, with every model registered on it.
import { DatabaseError, Sequelize, UniqueConstraintError, type Transaction } from 'sequelize';
import { config } from '../server/config';
import { initModels } from './models';

export const sequelize = new Sequelize(config.DATABASE_URL, {
  dialect: 'postgres',
  logging: false,
  pool: { max: 10, idle: 10_000 },
  // Set on every connection at its start; a transaction may raise it for long work (SET LOCAL).
  dialectOptions: { statement_timeout: config.STATEMENT_TIMEOUT_SECONDS * 1000 },
});

export const models = initModels(sequelize);

/** Runs `work` in one database transaction: everything it writes lands together or not at all. */
export function inTransaction<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  return sequelize.transaction((transaction) => work(transaction));
}

export async function databaseIsUp(): Promise<boolean> {
  try {
    await sequelize.query('SELECT 1');
    return true;
  } catch {
    return false;
  }
}

/** An error of a statement run on a connection directly (pg's), as Sequelize would have raised it, so that
 * it is answered like any other query's (a unique key taken, a statement timed out). */
export function asSequelizeError(error: unknown) {
  if (!(error instanceof Error) || !('code' in error)) return error;
  const parent = error as Error & { code: string; sql: string };
  return parent.code === '23505' ? new UniqueConstraintError({ parent, message: parent.message }) : new DatabaseError(parent);
}
