// Readings and results name their bench file and piece; the database checks it once per statement
// (migration 0951) with the rules of a foreign key: a row naming a file or piece that does not exist
// is refused, whether it comes by INSERT or COPY and among however many good rows; rows never change
// what they name; a file or piece that rows name cannot be deleted or renumbered.
import type { Transaction } from 'sequelize';
import { beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '.';
import { copyRows } from './copy';
import { benchFile, sampleOf, uploadBench } from '../tests/helpers/bench';
import { receivedLot } from '../tests/helpers/receivedLot';

let fileId: number;
let pieceId: number;
let otherPieceId: number;
beforeAll(async () => {
  const lot = await receivedLot({ quantity: 5 });
  const { sample, pieces } = await sampleOf(lot.lotId);
  fileId = (await uploadBench(lot.lotId, 'checked.csv', benchFile(sample))).body.files[0].fileId;
  pieceId = pieces.find((p) => p.serial === sample[0])!.id;
  otherPieceId = pieces.find((p) => p.serial !== sample[0])!.id;
});

const MISSING = 2_000_000_000;
const reading = (file: number, line: number) => `${file}\t${line}\tX-1\t632.8\t{"serial": "X-1"}`;
/** The code PostgreSQL refused with and its message, or null when the work went through (then rolled back). */
async function refusal(work: (t: Transaction) => Promise<unknown>): Promise<string | null> {
  const t = await sequelize.transaction();
  try {
    await work(t);
    return null;
  } catch (error) {
    const cause = (error as { parent?: Error & { code?: string } }).parent ?? (error as Error & { code?: string });
    return `${cause.code}: ${cause.message}`;
  } finally {
    await t.rollback();
  }
}
const run =
  (sql: string, bind: unknown[] = []) =>
  (t: Transaction) =>
    sequelize.query(sql, { transaction: t, bind });

describe('readings and results name an existing file and piece, checked per statement', () => {
  it('takes rows that name existing files and pieces, by INSERT and by COPY', async () => {
    expect(await refusal(run(`INSERT INTO readings (file_id, line, serial, wavelength_nm, fields) VALUES ($1, 1, 'X-1', 632.8, '{}')`, [fileId]))).toBeNull();
    expect(
      await refusal((t) =>
        copyRows(
          t,
          'readings',
          ['file_id', 'line', 'serial', 'wavelength_nm', 'fields'],
          Array.from({ length: 5000 }, (_, i) => reading(fileId, i + 1)),
        ),
      ),
    ).toBeNull();
    expect(
      await refusal(
        run(`INSERT INTO piece_results (piece_id, file_id, wavelength_nm, verdict, result) VALUES ($1, $2, 600, 'pass', '{}')`, [otherPieceId, fileId]),
      ),
    ).toBeNull();
  });

  it('refuses a row that names a file or a piece that does not exist, among however many good ones (23503, as a foreign key)', async () => {
    const rows = Array.from({ length: 5000 }, (_, i) => reading(i === 4321 ? MISSING : fileId, i + 1));
    expect(await refusal((t) => copyRows(t, 'readings', ['file_id', 'line', 'serial', 'wavelength_nm', 'fields'], rows))).toBe(
      `23503: insert into readings names measurement_files id ${MISSING}, which does not exist`,
    );
    expect(await refusal(run(`INSERT INTO readings (file_id, line, serial, wavelength_nm, fields) VALUES ($1, 1, 'X-1', 632.8, '{}')`, [MISSING]))).toMatch(
      /^23503: /,
    );
    expect(
      await refusal(run(`INSERT INTO piece_results (piece_id, file_id, wavelength_nm, verdict, result) VALUES ($1, $2, 600, 'pass', '{}')`, [MISSING, fileId])),
    ).toBe(`23503: insert into piece_results names pieces id ${MISSING}, which does not exist`);
    expect(
      await refusal(
        run(`INSERT INTO piece_results (piece_id, file_id, wavelength_nm, verdict, result) VALUES ($1, $2, 600, 'pass', '{}')`, [otherPieceId, MISSING]),
      ),
    ).toMatch(/^23503: /);
  });

  it('keeps what each row names, and keeps the files and pieces that rows name', async () => {
    expect(await refusal(run('UPDATE readings SET file_id = file_id + 0 WHERE file_id = $1', [fileId]))).toBeNull();
    expect(await refusal(run(`UPDATE readings SET file_id = $2 WHERE file_id = $1`, [fileId, MISSING]))).toMatch(/^23503: /);
    expect(await refusal(run(`UPDATE piece_results SET piece_id = $2 WHERE file_id = $1`, [fileId, otherPieceId]))).toMatch(/^23503: /);
    expect(await refusal(run('DELETE FROM measurement_files WHERE id = $1', [fileId]))).toMatch(
      /^23503: measurement_files id \d+ is still named by (readings|piece_results)$/,
    );
    expect(await refusal(run('UPDATE measurement_files SET id = $2 WHERE id = $1', [fileId, MISSING]))).toMatch(/^23503: /);
    expect(await refusal(run('DELETE FROM pieces WHERE id = $1', [pieceId]))).toBe(`23503: pieces id ${pieceId} is still named by piece_results`);
    // Superseding a result still only marks it.
    expect(await refusal(run('UPDATE piece_results SET superseded_by_file_id = $1 WHERE piece_id = $2', [fileId, pieceId]))).toBeNull();
  });
});
