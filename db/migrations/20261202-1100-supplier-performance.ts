// Supplier performance: a due date on each PO line (on-time delivery is a lot received on or before
// its line's date), the drift alarms raised on a supplier-part's lot means, and the mark up to which
// the drift check has read piece results. The check runs as a scheduled job on its own queue.
import type { Migration } from '../migrator';

const QUEUE = 'supplier-drift-check';

export const up: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      ALTER TABLE purchase_order_lines ADD COLUMN due_on date;

      CREATE TABLE drift_alarms (
        id serial PRIMARY KEY,
        supplier_id integer NOT NULL REFERENCES suppliers(id),
        part_id integer NOT NULL REFERENCES parts(id),
        characteristic varchar(12) NOT NULL CHECK (characteristic IN ('retardance', 'axis')),
        -- The lot whose mean took the EWMA past its limit.
        lot_id integer NOT NULL REFERENCES lots(id),
        direction varchar(4) NOT NULL CHECK (direction IN ('high', 'low')),
        lot_mean double precision NOT NULL,
        ewma double precision NOT NULL,
        limit_value double precision NOT NULL,
        sigma double precision NOT NULL CHECK (sigma > 0),
        lots_in_series integer NOT NULL CHECK (lots_in_series > 0),
        -- Pieces of that lot already failing when the alarm was raised (none: caught before failures).
        failing_pieces integer NOT NULL CHECK (failing_pieces >= 0),
        mail_id integer REFERENCES mail_outbox(id),
        raised_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (supplier_id, part_id, characteristic, lot_id)
      );
      CREATE INDEX drift_alarms_raised ON drift_alarms (supplier_id, raised_at);

      -- Piece results are numbered as they are written: the check reads those past the mark.
      CREATE TABLE drift_check_mark (
        id integer PRIMARY KEY CHECK (id = 1),
        last_result_id integer NOT NULL,
        checked_at timestamptz NOT NULL
      );
      `,
      { transaction },
    );
    // One check at a time; a missed run waits for the next occurrence, which reads from the same mark.
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
      DROP TABLE drift_check_mark, drift_alarms;
      ALTER TABLE purchase_order_lines DROP COLUMN due_on;
      `,
      { transaction },
    );
  });
