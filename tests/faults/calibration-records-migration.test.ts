// Migration 1200 on a database that has instruments: each instrument's two dates become its first
// calibration record, carried over with no certificate; from then on the dates on the instrument
// follow its newest record and cannot be written apart from one. And back down.
import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes, Sequelize } from 'sequelize';
import { createMigrator } from '../../db/migrator';
import { databaseUrl, dropDatabase, ensureDatabase } from '../../scripts/lib/postgres';
import { config } from '../../server/config';

const MIGRATION = '20261202-1200-calibration-records.ts';
const port = Number(new URL(config.DATABASE_URL).port);
const scratch = `${new URL(config.DATABASE_URL).pathname.slice(1)}_calibrations`;

afterAll(() => dropDatabase(port, scratch));

describe('calibration records from the instruments (migration 1200)', () => {
  it("turns each instrument's dates into its first record, then keeps the dates to the newest record", async () => {
    await ensureDatabase(port, scratch, { recreate: true });
    const owner = new Sequelize(databaseUrl(port, scratch, 'owner'), { dialect: 'postgres', logging: false });
    try {
      const migrator = createMigrator(owner);
      const before = (await migrator.pending()).map((m) => m.name).filter((name) => name < MIGRATION);
      await migrator.up({ to: before.at(-1) });
      await owner.query(
        `INSERT INTO instruments (code, kind, uncertainty_waves, uncertainty_deg, calibrated_on, calibration_due_on, created_at, updated_at)
         VALUES ('OLD-1', 'stokes-polarimeter', 0.001, 0.1, '2025-02-01', '2026-02-01', now(), '2025-02-03T08:00:00Z'),
                ('OLD-2', 'direct-retardance', 0.001, 0.1, '2026-04-01', '2027-04-01', now(), '2026-04-02T09:30:00Z')`,
      );
      await migrator.up({ to: MIGRATION });

      const records = await owner.query<{
        code: string;
        calibrated_on: string;
        due_on: string;
        carried_over: boolean;
        recorded_by: number | null;
        recorded_at: Date;
      }>(
        `SELECT i.code, c.calibrated_on, c.due_on, c.carried_over, c.recorded_by, c.recorded_at, c.certificate_storage_key
           FROM instrument_calibrations c JOIN instruments i ON i.id = c.instrument_id ORDER BY i.code`,
        { type: QueryTypes.SELECT },
      );
      expect(records).toEqual([
        expect.objectContaining({
          code: 'OLD-1',
          calibrated_on: '2025-02-01',
          due_on: '2026-02-01',
          carried_over: true,
          recorded_by: null,
          certificate_storage_key: null,
        }),
        expect.objectContaining({
          code: 'OLD-2',
          calibrated_on: '2026-04-01',
          due_on: '2027-04-01',
          carried_over: true,
          recorded_by: null,
          certificate_storage_key: null,
        }),
      ]);
      expect(records[0].recorded_at.toISOString()).toBe('2025-02-03T08:00:00.000Z');

      // A newer record moves the instrument's dates in the same statement's transaction; an older one does not.
      await owner.query(`INSERT INTO instrument_calibrations (instrument_id, calibrated_on, due_on, carried_over)
        SELECT id, '2026-02-10', '2027-02-10', true FROM instruments WHERE code = 'OLD-1'`);
      await owner.query(`INSERT INTO instrument_calibrations (instrument_id, calibrated_on, due_on, carried_over)
        SELECT id, '2024-02-10', '2025-02-10', true FROM instruments WHERE code = 'OLD-1'`);
      const dates = await owner.query(`SELECT code, calibrated_on, calibration_due_on FROM instruments ORDER BY code`, { type: QueryTypes.SELECT });
      expect(dates).toEqual([
        { code: 'OLD-1', calibrated_on: '2026-02-10', calibration_due_on: '2027-02-10' },
        { code: 'OLD-2', calibrated_on: '2026-04-01', calibration_due_on: '2027-04-01' },
      ]);
      await expect(owner.query(`UPDATE instruments SET calibration_due_on = '2030-01-01' WHERE code = 'OLD-2'`)).rejects.toThrow(
        'The calibration dates of instrument OLD-2 follow its calibration records; record a calibration instead',
      );

      await migrator.down({ to: MIGRATION });
      const [{ table }] = await owner.query<{ table: string | null }>(`SELECT to_regclass('instrument_calibrations')::text AS table`, {
        type: QueryTypes.SELECT,
      });
      expect(table).toBeNull();
      await owner.query(`UPDATE instruments SET calibration_due_on = '2030-01-01' WHERE code = 'OLD-2'`);
    } finally {
      await owner.close();
    }
  });
});
