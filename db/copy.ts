// Bulk writes with PostgreSQL's COPY, on the connection of a Sequelize transaction, so that the rows
// land with the rest of the transaction's work or not at all. Rows go as COPY text in pieces: no
// statement text of the whole set is built, and nothing is read back.
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

/** Rows are gathered into pieces of about this many characters. */
const CHUNK_CHARS = 1 << 16;

/**
 * Rows of COPY text (cells from copyCell joined by tabs), gathered into pieces as they are added:
 * a compact form to hold rows in until they can be sent (one string per piece, not one per cell).
 */
export class CopyText {
  private readonly pieces: string[] = [];
  private pending: string[] = [];
  private pendingChars = 0;
  rows = 0;

  add(row: string): void {
    this.pending.push(row);
    this.pendingChars += row.length + 1;
    this.rows++;
    if (this.pendingChars >= CHUNK_CHARS) this.seal();
  }

  /** Takes the pieces made so far (all of them when `all`), leaving none behind. */
  take(all = false): string[] {
    if (all && this.pending.length) this.seal();
    return this.pieces.splice(0);
  }

  private seal() {
    this.pieces.push(`${this.pending.join('\n')}\n`);
    this.pending = [];
    this.pendingChars = 0;
  }
}

const connectionOf = (transaction: Transaction) => (transaction as Transaction & { connection?: ClientBase }).connection;

/**
 * COPY pieces of text (whole rows, each ended by a line break) into `table`'s `columns` within
 * `transaction`, as fast as PostgreSQL takes them. Its refusals come back as Sequelize's errors,
 * so that they are answered like those of any other query (a value out of range is the client's to fix).
 */
export async function copyText(transaction: Transaction, table: string, columns: readonly string[], pieces: Iterable<string>): Promise<void> {
  const connection = connectionOf(transaction);
  if (!connection) throw new Error('COPY needs a transaction that holds its connection');
  const stream = connection.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN`));
  const finished = new Promise<void>((resolve, reject) => {
    stream.on('finish', resolve);
    stream.on('error', reject);
  });
  // A refusal may arrive while pieces are still being written: it is answered once, below.
  finished.catch(() => undefined);
  try {
    for (const piece of pieces) {
      if (stream.errored) break;
      if (!stream.write(piece)) await Promise.race([new Promise((resolve) => stream.once('drain', resolve)), finished]);
    }
    if (!stream.errored) stream.end();
    await finished;
  } catch (error) {
    throw asSequelizeError(error);
  }
}

/** COPY rows (see CopyText) made one by one, sending each piece as soon as it is full; answers how many. */
export async function copyRows(transaction: Transaction, table: string, columns: readonly string[], rows: Iterable<string>): Promise<number> {
  const text = new CopyText();
  function* pieces() {
    for (const row of rows) {
      text.add(row);
      yield* text.take();
    }
    yield* text.take(true);
  }
  await copyText(transaction, table, columns, pieces());
  return text.rows;
}

function asSequelizeError(error: unknown) {
  if (!(error instanceof Error) || !('code' in error)) return error;
  const parent = error as Error & { code: string; sql: string };
  return parent.code === '23505' ? new UniqueConstraintError({ parent, message: parent.message }) : new DatabaseError(parent);
}
