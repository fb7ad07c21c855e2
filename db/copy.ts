// Bulk writes with PostgreSQL's COPY, on the connection of a Sequelize transaction, so that the rows
// land with the rest of the transaction's work or not at all. Rows go as COPY text in pieces: no
// statement text of the whole set is built, and nothing is read back.
import type { ClientBase } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import type { Transaction } from 'sequelize';
import { asSequelizeError } from './index';

/** A cell of COPY's text format: NULL, or the value with backslash, tab and line ends escaped. */
export function copyCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '\\N';
  const text = String(value);
  return /[\\\t\n\r]/.test(text) ? text.replace(/[\\\t\n\r]/g, (c) => COPY_ESCAPES[c]) : text;
}

const COPY_ESCAPES: Record<string, string> = { '\\': '\\\\', '\t': '\\t', '\n': '\\n', '\r': '\\r' };

/** Rows are gathered into pieces of about this many characters. */
const CHUNK_CHARS = 1 << 16;
/** Up to about this much may wait to be sent before a writer is held back: enough for the database to
 * work on while the writer makes the next rows, little enough to keep the memory it takes small. */
const BACKLOG_CHARS = 4 << 20;

/**
 * Rows of COPY text (cells from copyCell joined by tabs), gathered into pieces as they are added:
 * a compact form to send or hold rows in (one string per piece, not one per cell).
 */
export class CopyText {
  private pending: string[] = [];
  private pendingChars = 0;
  rows = 0;

  /** Adds a row; answers the piece it completes, if it does. */
  add(row: string): string | undefined {
    this.pending.push(row);
    this.pendingChars += row.length + 1;
    this.rows++;
    return this.pendingChars >= CHUNK_CHARS ? this.seal() : undefined;
  }

  /** The last piece, if rows wait for one. */
  finish(): string | undefined {
    return this.pending.length ? this.seal() : undefined;
  }

  private seal() {
    const piece = `${this.pending.join('\n')}\n`;
    this.pending = [];
    this.pendingChars = 0;
    return piece;
  }
}

const connectionOf = (transaction: Transaction) => (transaction as Transaction & { connection?: ClientBase }).connection;

/** A COPY under way: pieces of text (whole rows, each ended by a line break) are written as they come. */
export type CopySink = {
  write(piece: string): void;
  /** Resolves once more may be written: at the next turn of the event loop (which sends what waits)
   * while little waits, else once PostgreSQL has taken it; at once when the COPY has failed (see end). */
  ready(): Promise<void>;
  readonly failed: boolean;
  /** Ends the COPY and waits for it; PostgreSQL's refusal comes back as Sequelize's error, so that it is
   * answered like that of any other query (a value out of range is the client's to fix). */
  end(): Promise<void>;
};

/** Starts a COPY into `table`'s `columns` on the connection of `transaction`. */
export function openCopy(transaction: Transaction, table: string, columns: readonly string[]): CopySink {
  const connection = connectionOf(transaction);
  if (!connection) throw new Error('COPY needs a transaction that holds its connection');
  const stream = connection.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN`));
  const finished = new Promise<void>((resolve, reject) => {
    stream.on('finish', resolve);
    stream.on('error', reject);
  });
  // A refusal may arrive while pieces are still being written: it is answered once, by end().
  const settled = finished.catch(() => undefined);
  return {
    write: (piece) => void (stream.errored || stream.write(piece)),
    ready: () => {
      if (stream.errored) return Promise.resolve();
      if (stream.writableLength < BACKLOG_CHARS) return new Promise<void>((resolve) => setImmediate(resolve));
      return Promise.race([new Promise<void>((resolve) => stream.once('drain', resolve)), settled]);
    },
    get failed() {
      return stream.errored !== null;
    },
    async end() {
      if (!stream.errored) stream.end();
      try {
        await finished;
      } catch (error) {
        throw asSequelizeError(error);
      }
    },
  };
}

/** COPY pieces of text (whole rows, each ended by a line break), as fast as PostgreSQL takes them. */
export async function copyText(transaction: Transaction, table: string, columns: readonly string[], pieces: Iterable<string>): Promise<void> {
  const sink = openCopy(transaction, table, columns);
  for (const piece of pieces) {
    if (sink.failed) break;
    sink.write(piece);
    await sink.ready();
  }
  await sink.end();
}

/** COPY rows (see CopyText) made one by one, sending each piece as soon as it is full; answers how many. */
export async function copyRows(transaction: Transaction, table: string, columns: readonly string[], rows: Iterable<string>): Promise<number> {
  const text = new CopyText();
  function* pieces() {
    for (const row of rows) {
      const piece = text.add(row);
      if (piece) yield piece;
    }
    const last = text.finish();
    if (last) yield last;
  }
  await copyText(transaction, table, columns, pieces());
  return text.rows;
}
