// One Sequelize instance for the process, with every model registered on it.
import { Sequelize, type Transaction } from 'sequelize';
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
