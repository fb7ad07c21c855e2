// Reminders of calibrations coming due (a scheduled job, run by whichever server process takes it):
// the quality managers are mailed when an instrument's newest calibration comes within each of the
// site's reminder thresholds (30 and 7 days before its due date unless set otherwise). Each threshold
// of a record is claimed by a row in the transaction that queues its mail, so a run repeated after a
// restart, or on a second server at once, mails once. Thresholds crossed together give one mail.
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { todayUtc } from '../../shared/calibration';
import { plural } from '../../shared/format';
import { INSTRUMENT_KIND_LABELS, type InstrumentView } from '../../shared/schemas/instruments';
import { recordAudit, SYSTEM_ACTOR } from '../audit/record';
import { config } from '../config';
import { QUEUES, type JobDefinition } from '../jobs/queue';
import { queueMail } from '../mail/outbox';
import { notify } from '../notifications/notify';
import { readSiteSettings } from '../settings/siteSettings';
import { calibrationsDue, type CalibrationDue } from './calibrations';

function reminderText(due: CalibrationDue) {
  const when = due.daysLeft === 0 ? 'today' : `in ${plural(due.daysLeft, 'day')}`;
  return {
    subject: `Calibration of ${due.code} is due ${when} (${due.dueOn})`,
    text: [
      `The calibration of instrument ${due.code} (${INSTRUMENT_KIND_LABELS[due.kind as InstrumentView['kind']]}), calibrated on ${due.calibratedOn}, is due ${when}, on ${due.dueOn}.`,
      `Bench files measured on it after ${due.dueOn} will be refused until a new calibration is recorded.`,
      '',
      `Record the new calibration and its certificate on the instrument's page:`,
      `${config.PUBLIC_URL}/instruments/${due.instrumentId}`,
    ].join('\n'),
  };
}

/** Sends the reminders owed today; answers them as instrument code and the thresholds each mail covers. */
export async function remindCalibrationsDue(today: string = todayUtc()): Promise<{ code: string; daysBefore: number[] }[]> {
  const { calibrationReminderDays } = await readSiteSettings();
  const horizon = Math.max(...calibrationReminderDays);
  // A lapsed calibration is past reminding: the page and the gate say so.
  const due = (await calibrationsDue(horizon, today)).filter((d) => d.daysLeft >= 0);
  const sent: { code: string; daysBefore: number[] }[] = [];
  for (const calibration of due) {
    const crossed = calibrationReminderDays.filter((threshold) => calibration.daysLeft <= threshold);
    const claimed = await inTransaction(async (transaction) => {
      const recipients = await sequelize.query<{ email: string }>(`SELECT email FROM users WHERE active AND 'quality' = ANY(roles) ORDER BY email`, {
        type: QueryTypes.SELECT,
        transaction,
      });
      // Nobody to tell yet: nothing is claimed, so the reminder goes once a quality manager exists.
      if (recipients.length === 0) return [];
      // A second run waits here on the first's rows and then finds them taken.
      const rows = await sequelize.query<{ days_before: number }>(
        `INSERT INTO calibration_reminders (calibration_id, days_before)
           SELECT :calibrationId, d FROM unnest(ARRAY[:crossed]::integer[]) AS d
         ON CONFLICT DO NOTHING RETURNING days_before`,
        { type: QueryTypes.SELECT, transaction, replacements: { calibrationId: calibration.calibrationId, crossed } },
      );
      if (rows.length === 0) return [];
      const daysBefore = rows.map((r) => r.days_before).sort((a, b) => b - a);
      const reminder = reminderText(calibration);
      const mail = await queueMail(
        { to: recipients.map((r) => r.email), ...reminder, related: { type: 'instrument', id: calibration.instrumentId } },
        transaction,
      );
      await notify(
        {
          kind: 'calibration-due',
          permission: 'instruments.read',
          title: reminder.subject,
          link: `/instruments/${calibration.instrumentId}`,
          entity: { type: 'instrument', id: calibration.instrumentId },
          roles: ['quality'],
        },
        transaction,
      );
      await sequelize.query(`UPDATE calibration_reminders SET mail_id = :mailId WHERE calibration_id = :calibrationId AND days_before IN (:daysBefore)`, {
        transaction,
        replacements: { mailId: mail.id, calibrationId: calibration.calibrationId, daysBefore },
      });
      await recordAudit(
        SYSTEM_ACTOR,
        {
          action: 'instrument.calibration.remind',
          entityType: 'instrument',
          entityId: calibration.instrumentId,
          after: { calibrationId: calibration.calibrationId, dueOn: calibration.dueOn, daysLeft: calibration.daysLeft, daysBefore },
        },
        transaction,
      );
      return daysBefore;
    });
    if (claimed.length) sent.push({ code: calibration.code, daysBefore: claimed });
  }
  return sent;
}

export const calibrationReminderJob: JobDefinition = {
  queue: QUEUES.calibrationReminders,
  // Every morning, 06:40 UTC.
  schedule: '40 6 * * *',
  async run() {
    await remindCalibrationsDue();
  },
};
