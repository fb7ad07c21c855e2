// The background work every server process takes part in (server/jobs): export bundles, mail
// delivery, the scheduled sweeps of due mail and of orphan files, reminders of overdue corrective
// actions, the suppliers' drift check and calibrations coming due. Whichever process takes a job does it; a job whose
// process dies is retried by another.
import { startJobs, stopJobs, QUEUES, type JobDefinition } from './jobs/queue';
import { mailJobs } from './mail/outbox';
import { exportJob } from './exports/exportJobs';
import { sweepOrphanBlobs } from './storage/sweep';
import { correctiveReminderJob } from './supplierquality/reminders';
import { driftCheckJob } from './supplierperformance/drift';
import { calibrationReminderJob } from './instruments/reminders';

const blobSweepJob: JobDefinition = {
  queue: QUEUES.blobSweep,
  schedule: '17 * * * *',
  async run() {
    await sweepOrphanBlobs();
  },
};

export const startBackgroundWork = () => startJobs([exportJob, ...mailJobs, blobSweepJob, correctiveReminderJob, driftCheckJob, calibrationReminderJob]);

export const stopBackgroundWork = stopJobs;
