// The audit trail: append-only at the database level, each row chained to the one before by a
// SHA-256 digest computed inside PostgreSQL, so neither the app nor a hand edit can rewrite history
// unnoticed.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE audit_events (
      id bigserial PRIMARY KEY,
      occurred_at timestamptz NOT NULL DEFAULT now(),
      actor_id integer REFERENCES users(id),
      actor_email varchar(254),
      actor_roles varchar(20)[] NOT NULL DEFAULT '{}',
      action varchar(80) NOT NULL,
      entity_type varchar(60) NOT NULL,
      entity_id varchar(120),
      before jsonb,
      after jsonb,
      request_id varchar(64),
      address varchar(64),
      prev_hash char(64),
      hash char(64) NOT NULL
    );
    CREATE INDEX audit_events_entity ON audit_events (entity_type, entity_id);
    CREATE INDEX audit_events_time ON audit_events (occurred_at);

    CREATE FUNCTION audit_event_digest(prev text, e audit_events) RETURNS char(64) LANGUAGE sql IMMUTABLE AS $$
      SELECT encode(sha256(convert_to(concat_ws('|',
        coalesce(prev, ''), e.id::text,
        to_char(e.occurred_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US'),
        coalesce(e.actor_id::text, ''), coalesce(e.actor_email, ''), array_to_string(e.actor_roles, ','),
        e.action, e.entity_type, coalesce(e.entity_id, ''),
        coalesce(e.before::text, ''), coalesce(e.after::text, ''),
        coalesce(e.request_id, ''), coalesce(e.address, '')
      ), 'UTF8')), 'hex')
    $$;

    CREATE FUNCTION audit_events_chain() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      -- One writer at a time extends the chain, so two inserts never share a predecessor.
      PERFORM pg_advisory_xact_lock(4870001);
      SELECT hash INTO NEW.prev_hash FROM audit_events ORDER BY id DESC LIMIT 1;
      NEW.hash := audit_event_digest(NEW.prev_hash, NEW);
      RETURN NEW;
    END $$;

    CREATE FUNCTION audit_events_refuse_rewrite() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'audit_events is append-only: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
    END $$;

    CREATE TRIGGER audit_events_chain BEFORE INSERT ON audit_events FOR EACH ROW EXECUTE FUNCTION audit_events_chain();
    CREATE TRIGGER audit_events_no_rewrite BEFORE UPDATE OR DELETE ON audit_events FOR EACH ROW EXECUTE FUNCTION audit_events_refuse_rewrite();
    CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events FOR EACH STATEMENT EXECUTE FUNCTION audit_events_refuse_rewrite();
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP TABLE audit_events;
    DROP FUNCTION audit_events_chain();
    DROP FUNCTION audit_events_refuse_rewrite();
    DROP FUNCTION audit_event_digest(text, audit_events);
  `);
};
