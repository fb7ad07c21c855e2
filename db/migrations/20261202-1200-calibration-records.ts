// Calibrations become records: each instrument keeps the history of its calibrations (dates, who
// performed it, the certificate's number, the uncertainties it states, the certificate PDF in the
// file store). Each instrument's two dates become its first record, marked as carried over. The dates
// on `instruments` stay as a derived value, the newest record's, written by a trigger in the
// transaction that writes a record and refused when written any other way: one truth.
// Reminders before a due date are claimed per record and threshold, so a job run twice (or on two
// servers) mails once; they run as a scheduled job on their own queue.
import type { Migration } from '../migrator';

const QUEUE = 'calibration-reminders';

export const up: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      CREATE TABLE instrument_calibrations (
        id serial PRIMARY KEY,
        instrument_id integer NOT NULL REFERENCES instruments(id),
        calibrated_on date NOT NULL,
        due_on date NOT NULL CHECK (due_on > calibrated_on),
        performed_by varchar(200) NOT NULL DEFAULT '',
        certificate_number varchar(80) NOT NULL DEFAULT '',
        uncertainty_retardance numeric(12, 6) CHECK (uncertainty_retardance >= 0),
        uncertainty_retardance_unit varchar(5) CHECK (uncertainty_retardance_unit IN ('waves', 'nm')),
        uncertainty_angle_deg numeric(8, 4) CHECK (uncertainty_angle_deg >= 0),
        uncertainty_note varchar(500) NOT NULL DEFAULT '',
        certificate_storage_key varchar(80),
        certificate_name varchar(255),
        certificate_size_bytes integer,
        carried_over boolean NOT NULL DEFAULT false,
        recorded_by integer REFERENCES users(id),
        recorded_at timestamptz NOT NULL DEFAULT now(),
        CHECK ((uncertainty_retardance IS NULL) = (uncertainty_retardance_unit IS NULL)),
        CHECK ((certificate_storage_key IS NULL) = (certificate_name IS NULL) AND (certificate_name IS NULL) = (certificate_size_bytes IS NULL)),
        CHECK (carried_over OR recorded_by IS NOT NULL)
      );
      CREATE INDEX instrument_calibrations_newest ON instrument_calibrations (instrument_id, calibrated_on DESC, id DESC);

      INSERT INTO instrument_calibrations (instrument_id, calibrated_on, due_on, carried_over, recorded_at)
        SELECT id, calibrated_on, calibration_due_on, true, updated_at FROM instruments ORDER BY id;

      -- The instrument's dates are its newest record's (latest calibration date, then latest entry).
      CREATE FUNCTION instrument_calibration_dates() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        UPDATE instruments i SET calibrated_on = c.calibrated_on, calibration_due_on = c.due_on
          FROM (SELECT calibrated_on, due_on FROM instrument_calibrations
                 WHERE instrument_id = NEW.instrument_id ORDER BY calibrated_on DESC, id DESC LIMIT 1) c
         WHERE i.id = NEW.instrument_id
           AND (i.calibrated_on, i.calibration_due_on) IS DISTINCT FROM (c.calibrated_on, c.due_on);
        RETURN NULL;
      END $$;
      CREATE TRIGGER instrument_calibrations_dates AFTER INSERT OR UPDATE OF calibrated_on, due_on ON instrument_calibrations
        FOR EACH ROW EXECUTE FUNCTION instrument_calibration_dates();

      CREATE FUNCTION instrument_dates_follow_records() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE newest record;
      BEGIN
        SELECT calibrated_on, due_on INTO newest FROM instrument_calibrations
         WHERE instrument_id = NEW.id ORDER BY calibrated_on DESC, id DESC LIMIT 1;
        IF FOUND AND (NEW.calibrated_on, NEW.calibration_due_on) IS DISTINCT FROM (newest.calibrated_on, newest.due_on) THEN
          RAISE EXCEPTION 'The calibration dates of instrument % follow its calibration records; record a calibration instead', NEW.code
            USING ERRCODE = 'check_violation';
        END IF;
        RETURN NEW;
      END $$;
      CREATE TRIGGER instruments_dates_follow_records BEFORE UPDATE OF calibrated_on, calibration_due_on ON instruments
        FOR EACH ROW EXECUTE FUNCTION instrument_dates_follow_records();

      CREATE TABLE calibration_reminders (
        calibration_id integer NOT NULL REFERENCES instrument_calibrations(id),
        days_before integer NOT NULL CHECK (days_before > 0),
        mail_id integer REFERENCES mail_outbox(id),
        sent_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (calibration_id, days_before)
      );

      -- An instrument's page lists the files measured with it, newest first.
      CREATE INDEX measurement_files_instrument ON measurement_files (instrument_id, uploaded_at DESC, id DESC);
      `,
      { transaction },
    );
    // One run at a time; a missed run waits for the next, which sends what is still owed.
    await sequelize.query(`SELECT pgboss.create_queue(:name, CAST(:options AS json))`, {
      transaction,
      replacements: { name: QUEUE, options: JSON.stringify({ policy: 'singleton', retryLimit: 2, retryDelay: 60, expireInSeconds: 600 }) },
    });
  });

export const down: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(`SELECT pgboss.delete_queue(:name)`, { transaction, replacements: { name: QUEUE } });
    await sequelize.query(
      `
      DROP INDEX measurement_files_instrument;
      DROP TABLE calibration_reminders;
      DROP TRIGGER instruments_dates_follow_records ON instruments;
      DROP FUNCTION instrument_dates_follow_records();
      DROP TABLE instrument_calibrations;
      DROP FUNCTION instrument_calibration_dates();
      `,
      { transaction },
    );
  });
