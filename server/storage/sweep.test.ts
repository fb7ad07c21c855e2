// Orphan files: what a rolled-back or killed transaction stored is deleted by the sweep; what a
// committed row names, or what an open transaction is storing, stays.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { MeasurementFile } from '../../db/models';
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { as } from '../../tests/helpers/api';
import { receivedLot } from '../../tests/helpers/receivedLot';
import { queueMail } from '../mail/outbox';
import { blobStore, sha256, storeBlob } from './blobs';
import { BLOB_REFERENCES, sweepOrphanBlobs } from './sweep';

const TODAY = new Date().toISOString().slice(0, 10);

async function lotWithBenchFile() {
  const lot = await receivedLot({ quantity: 8 });
  const inspector = await as('inspector');
  const view = await inspector.get(`/api/inspection/lots/${lot.lotId}`).expect(200);
  const sample = (view.body.pieces as { serial: string; inSample: boolean }[]).filter((p) => p.inSample).map((p) => p.serial);
  const file = stokesBenchFile(
    sample.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves: 0.25, fastAxisDeg: 0.05 })),
    { instrument: 'BENCH-2', date: TODAY, noise: 0.0004, seed: Math.floor(Math.random() * 1e6) },
  );
  const commit = () =>
    inspector.post(`/api/inspection/lots/${lot.lotId}/measurements`).attach('files', Buffer.from(file), { filename: 'bench.csv', contentType: 'text/csv' });
  return { lot, file, key: sha256(file), commit };
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe('orphan files', () => {
  it('a bench-file commit that rolls back leaves its file only until the sweep; a committed one stays', async () => {
    const { lot, key, commit } = await lotWithBenchFile();
    // The row that would name the stored file fails to be written: the transaction rolls back.
    vi.spyOn(MeasurementFile, 'create').mockRejectedValueOnce(new Error('connection lost'));
    await commit().expect(500);
    expect(await MeasurementFile.count({ where: { lotId: lot.lotId } })).toBe(0);
    expect(await blobStore.has(key)).toBe(true);

    // Younger than the grace period (an hour by default): left alone.
    expect((await sweepOrphanBlobs()).removed).not.toContain(key);
    expect((await sweepOrphanBlobs({ graceMs: 0 })).removed).toContain(key);
    expect(await blobStore.has(key)).toBe(false);

    vi.restoreAllMocks();
    await commit().expect(201);
    expect(await blobStore.has(key)).toBe(true);
    expect((await sweepOrphanBlobs({ graceMs: 0 })).removed).not.toContain(key);
    expect(await blobStore.has(key)).toBe(true);
  });

  it('a transaction whose connection dies (its process killed) leaves its file to the sweep', async () => {
    const bytes = Buffer.from(`killed ${Math.random()}`);
    const key = sha256(bytes);
    const died = await inTransaction(async (transaction) => {
      await storeBlob(bytes, transaction);
      const [{ pid }] = await sequelize.query<{ pid: number }>('SELECT pg_backend_pid() AS pid', { type: QueryTypes.SELECT, transaction });
      await sequelize.query('SELECT pg_terminate_backend(:pid)', { replacements: { pid } });
      await sequelize.query('SELECT 1', { transaction });
    }).catch((error: Error) => error);
    expect(died).toBeInstanceOf(Error);
    expect(await blobStore.has(key)).toBe(true);
    expect((await sweepOrphanBlobs({ graceMs: 0 })).removed).toContain(key);
  });

  it('leaves a file alone while the transaction storing it is open, then keeps it once a row names it', async () => {
    const bytes = Buffer.from(`%PDF-1.4 attached ${Math.random()}`);
    const key = sha256(bytes);
    await inTransaction(async (transaction) => {
      await queueMail(
        {
          to: ['buyer@phaselot.test'],
          subject: 'Sweep test',
          text: 'Attached.',
          attachments: [{ filename: 'a.pdf', contentType: 'application/pdf', content: bytes }],
        },
        transaction,
      );
      // Not committed yet: no row names the file, but its key is locked by this transaction.
      expect((await sweepOrphanBlobs({ graceMs: 0 })).removed).not.toContain(key);
    });
    expect((await sweepOrphanBlobs({ graceMs: 0 })).removed).not.toContain(key);
    expect(await blobStore.has(key)).toBe(true);
  });

  it('knows every column that names a stored file', async () => {
    const columns = await sequelize.query<{ table_name: string; column_name: string }>(
      `SELECT table_name, column_name FROM information_schema.columns WHERE table_schema = 'public' AND (column_name LIKE '%storage\\_key' OR column_name = 'blob_key')`,
      { type: QueryTypes.SELECT },
    );
    const known = BLOB_REFERENCES.map((r) => `${r.table}.${r.column}`);
    for (const { table_name, column_name } of columns) expect(known, `${table_name}.${column_name}`).toContain(`${table_name}.${column_name}`);
  });
});
