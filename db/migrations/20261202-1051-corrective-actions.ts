// Corrective-action requests (CARs) to suppliers, raised from one or several NCRs of one supplier's
// part and mailed to the supplier's quality contact (a new field of the supplier) with a signed,
// expiring link to a response form that needs no account. Each link reaches one request, works for
// one submission and can be revoked; the supplier's answers (with attached files in the file store),
// quality's review of each, the later lots checked for effectiveness, and the hits of the public
// form's rate limit are kept here. A scheduled job reminds overdue requests; a resumption of
// inspection after discontinuation may name the accepted request it rests on.
import type { Migration } from '../migrator';

const QUEUE = 'corrective-action-reminders';

export const up: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      ALTER TABLE suppliers ADD COLUMN quality_contact_email varchar(254);

      CREATE TABLE corrective_actions (
        id serial PRIMARY KEY,
        number varchar(20) NOT NULL UNIQUE,
        supplier_id integer NOT NULL REFERENCES suppliers(id),
        part_id integer NOT NULL REFERENCES parts(id),
        problem text NOT NULL,
        response_due_on date NOT NULL,
        status varchar(20) NOT NULL DEFAULT 'awaiting-response' CHECK (status IN ('awaiting-response', 'responded', 'accepted', 'closed')),
        -- The address the request (and each new link) went to.
        sent_to varchar(254) NOT NULL,
        requested_by integer NOT NULL REFERENCES users(id),
        requested_at timestamptz NOT NULL DEFAULT now(),
        accepted_by integer REFERENCES users(id),
        accepted_at timestamptz,
        closed_by integer REFERENCES users(id),
        closed_at timestamptz,
        effectiveness_note text,
        last_reminded_at timestamptz,
        updated_at timestamptz NOT NULL DEFAULT now(),
        CHECK ((status = 'closed') = (closed_at IS NOT NULL)),
        CHECK (status NOT IN ('accepted', 'closed') OR accepted_at IS NOT NULL)
      );
      CREATE INDEX corrective_actions_supplier_part ON corrective_actions (supplier_id, part_id);
      CREATE INDEX corrective_actions_due ON corrective_actions (response_due_on) WHERE status = 'awaiting-response';

      CREATE TABLE corrective_action_nonconformances (
        corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
        nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
        PRIMARY KEY (corrective_action_id, nonconformance_id)
      );
      CREATE INDEX corrective_action_nonconformances_ncr ON corrective_action_nonconformances (nonconformance_id);

      CREATE TABLE corrective_action_links (
        id serial PRIMARY KEY,
        corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
        issued_by integer REFERENCES users(id),
        issued_at timestamptz NOT NULL,
        expires_at timestamptz NOT NULL CHECK (expires_at > issued_at),
        revoked_at timestamptz,
        revoked_by integer REFERENCES users(id),
        submitted_at timestamptz
      );
      -- One live link per request: a new one is issued only once the last is revoked or used.
      CREATE UNIQUE INDEX corrective_action_links_live ON corrective_action_links (corrective_action_id) WHERE revoked_at IS NULL AND submitted_at IS NULL;

      CREATE TABLE corrective_action_responses (
        id serial PRIMARY KEY,
        corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
        -- A link takes one submission.
        link_id integer NOT NULL UNIQUE REFERENCES corrective_action_links(id),
        responder_name varchar(120) NOT NULL,
        root_cause text NOT NULL,
        containment text NOT NULL,
        corrective_actions text NOT NULL,
        preventive_actions text NOT NULL,
        containment_on date,
        corrective_due_on date NOT NULL,
        preventive_due_on date,
        submitted_at timestamptz NOT NULL DEFAULT now(),
        address varchar(64),
        user_agent varchar(300),
        review varchar(10) CHECK (review IN ('accepted', 'returned')),
        reviewed_by integer REFERENCES users(id),
        reviewed_at timestamptz,
        review_note text,
        CHECK ((review IS NULL) = (reviewed_at IS NULL))
      );
      CREATE INDEX corrective_action_responses_car ON corrective_action_responses (corrective_action_id);

      CREATE TABLE corrective_action_attachments (
        id serial PRIMARY KEY,
        response_id integer NOT NULL REFERENCES corrective_action_responses(id),
        name varchar(255) NOT NULL,
        media_type varchar(40) NOT NULL CHECK (media_type IN ('application/pdf', 'image/png', 'image/jpeg')),
        size integer NOT NULL CHECK (size > 0),
        storage_key char(64) NOT NULL
      );
      CREATE INDEX corrective_action_attachments_response ON corrective_action_attachments (response_id);

      -- Later lots of the supplier's part quality checked before closing the request as effective.
      CREATE TABLE corrective_action_checked_lots (
        corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
        lot_id integer NOT NULL REFERENCES lots(id),
        PRIMARY KEY (corrective_action_id, lot_id)
      );

      -- Fixed-window counters of the public response form's rate limit, shared by every server process.
      CREATE TABLE rate_limit_hits (
        key varchar(200) PRIMARY KEY,
        hits integer NOT NULL,
        reset_at timestamptz NOT NULL
      );

      ALTER TABLE switching_events ADD COLUMN corrective_action_id integer REFERENCES corrective_actions(id);
    `,
      { transaction },
    );
    // A run that is missed simply waits for the next occurrence; one at a time.
    await sequelize.query(`SELECT pgboss.create_queue(:name, CAST(:options AS json))`, {
      transaction,
      replacements: { name: QUEUE, options: JSON.stringify({ policy: 'singleton', retryLimit: 2, retryDelay: 60, expireInSeconds: 600 }) },
    });
  });

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    SELECT pgboss.delete_queue('${QUEUE}');
    ALTER TABLE switching_events DROP COLUMN corrective_action_id;
    DROP TABLE rate_limit_hits, corrective_action_checked_lots, corrective_action_attachments, corrective_action_responses, corrective_action_links,
      corrective_action_nonconformances, corrective_actions;
    ALTER TABLE suppliers DROP COLUMN quality_contact_email;
  `);
};
