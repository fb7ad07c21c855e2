import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import nodemailer from 'nodemailer';
import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { daysBetween, todayUtc } from '../../shared/calibration';
import { as } from '../../tests/helpers/api';
import { uniqueTag } from '../../tests/helpers/purchasing';
import { startMailCatcher } from '../mail/catcher';
import { readCaughtMail } from '../mail/caughtMail';
import { deliverDueMail } from '../mail/outbox';
import { calibrationsDue } from './calibrations';
import { remindCalibrationsDue } from './reminders';

const plusDays = (day: string, n: number) => new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** An instrument calibrated a year ago, due `daysLeft` days from today. */
async function instrumentDueIn(daysLeft: number) {
  const dueOn = plusDays(todayUtc(), daysLeft);
  const created = await (
    await as('quality')
  )
    .post('/api/instruments')
    .send({
      code: `T-REM-${uniqueTag()}`,
      kind: 'rotating-plate',
      uncertaintyWaves: 0.001,
      uncertaintyDeg: 0.1,
      calibratedOn: plusDays(dueOn, -365),
      calibrationDueOn: dueOn,
    })
    .expect(201);
  return { id: created.body.id as number, code: created.body.code as string, dueOn };
}

const qualityEmails = async () =>
  (await sequelize.query<{ email: string }>(`SELECT email FROM users WHERE active AND 'quality' = ANY(roles) ORDER BY email`, { type: QueryTypes.SELECT })).map(
    (u) => u.email,
  );

describe('calibration reminders', () => {
  it('mails the quality managers at 30 and at 7 days before the due date, once per threshold, through the mail catcher', async () => {
    const soon = await instrumentDueIn(20);
    const sooner = await instrumentDueIn(5);
    const later = await instrumentDueIn(45);

    const first = await remindCalibrationsDue();
    const mine = (code: string) => first.find((r) => r.code === code);
    // Site defaults: 30 and 7 days. 20 days left has crossed 30; 5 days left has crossed both, in one mail.
    expect(mine(soon.code)).toEqual({ code: soon.code, daysBefore: [30] });
    expect(mine(sooner.code)).toEqual({ code: sooner.code, daysBefore: [30, 7] });
    expect(mine(later.code)).toBeUndefined();

    // Run again (a restart, a second server): nothing more for these.
    const again = await remindCalibrationsDue();
    expect(again.map((r) => r.code)).not.toContain(soon.code);
    expect(again.map((r) => r.code)).not.toContain(sooner.code);

    // Thirteen days on, the first comes within 7 days: its second reminder, and only that.
    const weekLater = await remindCalibrationsDue(plusDays(todayUtc(), 14));
    expect(weekLater.find((r) => r.code === soon.code)).toEqual({ code: soon.code, daysBefore: [7] });
    expect(weekLater.find((r) => r.code === sooner.code)).toBeUndefined();

    const dir = mkdtempSync(join(tmpdir(), 'phaselot-calibration-mail-'));
    const catcher = await startMailCatcher({ port: 0, dir });
    try {
      await deliverDueMail(nodemailer.createTransport(`smtp://127.0.0.1:${catcher.port}`));
      const caught = await readCaughtMail(dir);
      const about = (code: string) => caught.filter((m) => m.subject.startsWith(`Calibration of ${code} is due`));
      expect(
        about(soon.code)
          .map((m) => m.subject)
          .sort(),
      ).toEqual([`Calibration of ${soon.code} is due in 20 days (${soon.dueOn})`, `Calibration of ${soon.code} is due in 6 days (${soon.dueOn})`]);
      const [soonerMail] = about(sooner.code);
      expect(about(sooner.code)).toHaveLength(1);
      expect(soonerMail.to.split(', ').sort()).toEqual(await qualityEmails());
      expect(soonerMail.text).toContain(`/instruments/${sooner.id}`);
      expect(soonerMail.text).toContain(`is due in 5 days, on ${sooner.dueOn}`);
    } finally {
      await catcher.close();
    }
  });

  it('mails once when two servers run the job at the same moment', async () => {
    const due = await instrumentDueIn(3);
    const [a, b] = await Promise.all([remindCalibrationsDue(), remindCalibrationsDue()]);
    expect([...a, ...b].filter((r) => r.code === due.code)).toEqual([{ code: due.code, daysBefore: [30, 7] }]);
    const [{ mails }] = await sequelize.query<{ mails: string }>(
      `SELECT count(*) AS mails FROM mail_outbox WHERE related_type = 'instrument' AND related_id = :id`,
      { type: QueryTypes.SELECT, replacements: { id: String(due.id) } },
    );
    expect(Number(mails)).toBe(1);
  });

  it('lists instruments by due date for the dashboards, lapsed ones with negative days', async () => {
    const lapsed = await instrumentDueIn(-2);
    const due = await instrumentDueIn(10);
    const listed = await calibrationsDue(12);
    const mine = listed.filter((d) => d.code === lapsed.code || d.code === due.code);
    expect(mine.map((d) => [d.code, d.daysLeft])).toEqual([
      [lapsed.code, -2],
      [due.code, 10],
    ]);
    // Soonest first throughout.
    expect(listed.map((d) => d.dueOn)).toEqual([...listed.map((d) => d.dueOn)].sort());
    expect(listed.every((d) => d.daysLeft === daysBetween(todayUtc(), d.dueOn))).toBe(true);
    expect((await calibrationsDue(5)).map((d) => d.code)).not.toContain(due.code);
  });
});
