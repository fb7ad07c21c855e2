// Mail is written to an outbox in the same transaction as the event that causes it, and a worker
// delivers it: a relay that is down delays a message, it never loses one.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE mail_outbox (
      id serial PRIMARY KEY,
      recipients varchar(254)[] NOT NULL CHECK (cardinality(recipients) > 0),
      subject varchar(300) NOT NULL,
      body_text text NOT NULL,
      attachments jsonb NOT NULL DEFAULT '[]',
      related_type varchar(60),
      related_id varchar(120),
      status varchar(12) NOT NULL DEFAULT 'queued' CHECK (status IN ('queued', 'sent')),
      attempts integer NOT NULL DEFAULT 0,
      next_attempt_at timestamptz NOT NULL DEFAULT now(),
      last_error text,
      sent_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX mail_outbox_due ON mail_outbox (next_attempt_at) WHERE status = 'queued';
  `);
};

export const down: Migration = async ({ queryInterface }) => {
  await queryInterface.dropTable('mail_outbox');
};
