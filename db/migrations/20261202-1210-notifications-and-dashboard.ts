// In-app notifications: one row per recipient, written in the transaction of the event it tells of.
// Each row keeps the permission its subject needs, so a user whose roles no longer grant it stops
// seeing it (and counting it) without the row being rewritten. Besides, the indexes the dashboards'
// reads need to stay quick on a large site: the newest documents, the current rejections, open NCRs
// and corrective actions in age order, and open PO lines by due date.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE notifications (
      id serial PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users(id),
      kind varchar(30) NOT NULL
        CHECK (kind IN ('lot-rejected', 'awaiting-signature', 'ncr-opened', 'corrective-answered', 'calibration-due')),
      permission varchar(40) NOT NULL,
      title varchar(300) NOT NULL,
      link varchar(200) NOT NULL CHECK (link LIKE '/%'),
      entity_type varchar(40) NOT NULL,
      entity_id integer NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      read_at timestamptz
    );
    CREATE INDEX notifications_user ON notifications (user_id, created_at DESC, id DESC);
    CREATE INDEX notifications_unread ON notifications (user_id) WHERE read_at IS NULL;

    CREATE INDEX lot_documents_issued ON lot_documents (issued_at DESC, id DESC);
    CREATE INDEX dispositions_current_rejections ON dispositions (signed_at DESC, id DESC)
      WHERE superseded_at IS NULL AND decision IN ('reject', 'sort');
    CREATE INDEX nonconformances_open_age ON nonconformances (opened_at, id) WHERE status <> 'closed';
    CREATE INDEX corrective_actions_open_age ON corrective_actions (requested_at, id) WHERE status <> 'closed';
    CREATE INDEX purchase_order_lines_due ON purchase_order_lines (due_on, id) WHERE due_on IS NOT NULL;
    CREATE INDEX purchase_orders_open ON purchase_orders (id) WHERE status = 'open';
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP INDEX purchase_orders_open, purchase_order_lines_due, corrective_actions_open_age, nonconformances_open_age,
      dispositions_current_rejections, lot_documents_issued;
    DROP TABLE notifications;
  `);
};
