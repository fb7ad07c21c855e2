// An export whose last try dies with its process is not left "running": the queue's maintenance
// fails the abandoned try, and the job given up is recorded on the export with the reason.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../../db';
import { as } from '../../../tests/helpers/api';
import { acceptedLot } from '../../../tests/helpers/acceptedLot';
import type { ExportJobView } from '../../../shared/schemas/exports';

// The queue looks for dead tries every second here (60 s by default), before config is read.
vi.hoisted(() => {
  process.env.JOBS_MAINTENANCE_SECONDS = '1';
});

const { startBackgroundWork, stopBackgroundWork } = await import('../../background');

const TODAY = new Date().toISOString().slice(0, 10);

afterAll(() => stopBackgroundWork());

let auditor: Awaited<ReturnType<typeof as>>;
let supplierId: number;
beforeAll(async () => {
  auditor = await as('auditor');
  supplierId = (await acceptedLot(10)).supplierId;
});

describe('an interrupted export', () => {
  it('fails cleanly with the reason when its last try was cut off by a dead process', async () => {
    // Requested while no process works the queue.
    const requested = (await auditor.post('/api/exports').send({ from: TODAY, to: TODAY, supplierId }).expect(202)).body as ExportJobView;
    const [{ queue_job_id: queueJobId }] = await sequelize.query<{ queue_job_id: string }>('SELECT queue_job_id FROM export_jobs WHERE id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: requested.id },
    });
    // As a process leaves it that was killed during the last try the queue allows: the try is
    // still "active", started long ago, and the export shows it running.
    await sequelize.query(
      `UPDATE pgboss.job SET state = 'active', started_on = now() - interval '2 hours', retry_count = retry_limit WHERE name = 'export-build' AND id = :id`,
      { replacements: { id: queueJobId } },
    );
    await sequelize.query(`UPDATE export_jobs SET status = 'running', attempt = 2 WHERE id = :id`, { replacements: { id: requested.id } });

    await startBackgroundWork();
    let job = requested;
    for (let i = 0; i < 300 && job.status !== 'failed'; i++) {
      await new Promise((wait) => setTimeout(wait, 100));
      job = (await auditor.get(`/api/exports/${requested.id}`).expect(200)).body;
    }
    expect(job).toMatchObject({
      status: 'failed',
      error: 'Given up after 3 tries: the last try was cut off (its server process stopped, or it ran past its time limit)',
      finishedAt: expect.any(String),
    });
    const [queued] = await sequelize.query<{ state: string; retry_count: number }>(
      `SELECT state, retry_count FROM pgboss.job WHERE id = :id UNION ALL SELECT state, retry_count FROM pgboss.archive WHERE id = :id`,
      { type: QueryTypes.SELECT, replacements: { id: queueJobId } },
    );
    expect(queued).toEqual({ state: 'failed', retry_count: 2 });
    const refused = await auditor.get(`/api/exports/${requested.id}/download`).expect(409);
    expect(refused.body.error.message).toMatch(/^This export failed: Given up after 3 tries/);
  });
});
