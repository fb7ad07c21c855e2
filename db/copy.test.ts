import { describe, expect, it } from 'vitest';
import { DatabaseError, QueryTypes, UniqueConstraintError } from 'sequelize';
import { inTransaction, sequelize } from '.';
import { copyCell, copyRows } from './copy';

describe('COPY of rows within a transaction', () => {
  it('escapes the characters COPY text format gives a meaning, and writes NULL as \\N', () => {
    // PostgreSQL documentation, COPY, "Text Format": backslash, newline, carriage return and the
    // delimiter (tab) are written as \\, \n, \r and \t; \N is NULL.
    expect(copyCell('a\\b\tc\nd\re')).toBe('a\\\\b\\tc\\nd\\re');
    expect(copyCell(null)).toBe('\\N');
    expect(copyCell(undefined)).toBe('\\N');
    expect(copyCell(632.8)).toBe('632.8');
    expect(copyCell('plain "quoted" text, with commas')).toBe('plain "quoted" text, with commas');
  });

  it('reads back from PostgreSQL exactly what it was given, in the transaction that wrote it', async () => {
    const values = ['tab\there', 'line\nbreak', 'cr\rreturn', 'back\\slash', '\\N as text', 'ünïcödé λ ±0.003', '{"json": "\\"quoted\\""}'];
    const read = await inTransaction(async (transaction) => {
      await sequelize.query('CREATE TEMP TABLE copied (n int, text text, nothing text) ON COMMIT DROP', { transaction });
      const count = await copyRows(
        transaction,
        'copied',
        ['n', 'text', 'nothing'],
        values.map((v, i) => [i, copyCell(v), copyCell(null)].join('\t')),
      );
      expect(count).toBe(values.length);
      return sequelize.query<{ n: number; text: string; nothing: string | null }>('SELECT n, text, nothing FROM copied ORDER BY n', {
        type: QueryTypes.SELECT,
        transaction,
      });
    });
    expect(read.map((r) => r.text)).toEqual(values);
    expect(read.every((r) => r.nothing === null)).toBe(true);
  });

  it('sends many rows in pieces, and a refusal leaves the transaction to roll back as any query error does', async () => {
    const rows = Array.from({ length: 50_000 }, (_, i) => `${i}\t${'x'.repeat(20)}`);
    const counted = await inTransaction(async (transaction) => {
      await sequelize.query('CREATE TEMP TABLE many (n int PRIMARY KEY, text text) ON COMMIT DROP', { transaction });
      await copyRows(transaction, 'many', ['n', 'text'], rows);
      const [{ n }] = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM many', { type: QueryTypes.SELECT, transaction });
      return n;
    });
    expect(counted).toBe(50_000);

    // A key given twice, and a number out of the column's range: PostgreSQL's own refusals.
    const refused = (rowsOf: string[], column = 'int') =>
      inTransaction(async (transaction) => {
        await sequelize.query(`CREATE TEMP TABLE refusing (n ${column} PRIMARY KEY) ON COMMIT DROP`, { transaction });
        await copyRows(transaction, 'refusing', ['n'], rowsOf);
      }).catch((error: unknown) => error);
    const duplicate = await refused([...Array.from({ length: 30_000 }, (_, i) => String(i)), '7']);
    expect(duplicate).toBeInstanceOf(UniqueConstraintError);
    const outOfRange = await refused(['12345678.9'], 'numeric(9, 3)');
    expect(outOfRange).toBeInstanceOf(DatabaseError);
    expect(((outOfRange as DatabaseError).parent as { code?: string }).code).toBe('22003');
    // The connection went back to the pool in a usable state.
    expect(await sequelize.query('SELECT 1 AS one', { type: QueryTypes.SELECT })).toEqual([{ one: 1 }]);
  });
});
