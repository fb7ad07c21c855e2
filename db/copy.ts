// Bulk writes with PostgreSQL's COPY, on the connection of a Sequelize transaction, so that the rows
// land with the rest of the transaction's work or not at all. Rows are streamed as they are made:
// no statement text of the whole set is built, and nothing is read back.
import type { ClientBase } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { DatabaseError, UniqueConstraintError, type Transaction } from 'sequelize';

/** A cell of COPY's text format: NULL, or the value with backslash, tab and line ends escaped. */
export function copyCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '\\N';
  const text = String(value);
  return /[\\\t\n\r]/.test(text) ? text.replace(/[\\\t\n\r]/g, (c) => COPY_ESCAPES[c]) : text;
}

const COPY_ESCAPES: Record<string, string> = { '\\': '\\\\', '\t': '\\t', '\n': '\\n', '\r': '\\r' };

/** Rows are sent in pieces of about this many characters. */
const CHUNK_CHARS = 1 << 16;

const connectionOf = (transaction: Transaction) => (transaction as Transaction & { connection?: ClientBase }).connection;

/**
 * COPY `rows` (each one line of COPY text: cells from copyCell joined by tabs) into `table`'s
 * `columns` within `transaction`. PostgreSQL's refusals come back as Sequelize's errors, so that
 * they are answered like those of any other query (a value out of range is the client's to fix).
 */
export async function copyRows(transaction: Transaction, table: string, columns: readonly string[], rows: Iterable<string>): Promise<number> {
  const connection = connectionOf(transaction);
  if (!connection) throw new Error('copyRows needs a transaction that holds its connection');
  const stream = connection.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN`));
  const finished = new Promise<void>((resolve, reject) => {
    stream.on('finish', resolve);
    stream.on('error', reject);
  });
  // A refusal may arrive while rows are still being written: it is answered once, below.
  finished.catch(() => undefined);
  let count = 0;
  try {
    let chunk = '';
    for (const row of rows) {
      chunk += `${row}\n`;
      count++;
      if (chunk.length >= CHUNK_CHARS) {
        if (stream.errored) break;
        if (!stream.write(chunk)) await Promise.race([new Promise((resolve) => stream.once('drain', resolve)), finished]);
        chunk = '';
      }
    }
    if (!stream.errored) stream.end(chunk);
    await finished;
  } catch (error) {
    throw asSequelizeError(error);
  }
  return count;
}

function asSequelizeError(error: unknown) {
  if (!(error instanceof Error) || !('code' in error)) return error;
  const parent = error as Error & { code: string; sql: string };
  return parent.code === '23505' ? new UniqueConstraintError({ parent, message: parent.message }) : new DatabaseError(parent);
}
