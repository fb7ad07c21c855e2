// The audit chain made linear by construction. Before, a row's id was drawn before the chain lock
// was taken and its predecessor was "the highest id so far", so concurrent writers could link a row
// to one that came after it (a fork that verification then reported as a break).
//
// Now every row gets a chain position `seq` from a single-row head table locked FOR UPDATE until the
// writing transaction ends: each writer reads the head (position and hash of the last row) under
// that lock, links its row to it and moves the head on. A rolled-back writer moves nothing.
//
// Existing rows keep their digests. They are numbered in id order, the order they were written in.
// Where that order does not link up (a fork left by the old trigger) and every row's own digest
// still holds, the rows from the first break on are re-linked in id order, and one
// `audit.chain-rebased` event records the old [id, prev_hash, hash] of each re-linked row, so the
// former digests stay checkable. Rows whose own digest no longer matches are never re-hashed: the
// chain is left as found and verification keeps reporting them.
import type { Migration } from '../migrator';

export const UP = `
  CREATE TABLE audit_chain_head (
    singleton boolean PRIMARY KEY DEFAULT true CHECK (singleton),
    seq bigint NOT NULL,
    hash char(64)
  );

  ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_rewrite;
  ALTER TABLE audit_events ADD COLUMN seq bigint;
  UPDATE audit_events SET seq = numbered.n
    FROM (SELECT id, row_number() OVER (ORDER BY id) AS n FROM audit_events) numbered
   WHERE numbered.id = audit_events.id;

  CREATE OR REPLACE FUNCTION audit_events_chain() RETURNS trigger LANGUAGE plpgsql AS $$
  DECLARE
    head audit_chain_head%ROWTYPE;
  BEGIN
    -- The head row stays locked until this transaction ends, so writers extend the chain one at a
    -- time and each links to the row the previous (committed) writer left at the head.
    SELECT * INTO STRICT head FROM audit_chain_head FOR UPDATE;
    NEW.seq := head.seq + 1;
    NEW.prev_hash := head.hash;
    NEW.hash := audit_event_digest(NEW.prev_hash, NEW);
    UPDATE audit_chain_head SET seq = NEW.seq, hash = NEW.hash;
    RETURN NEW;
  END $$;

  DO $$
  DECLARE
    first_break bigint;
    altered bigint;
    legacy jsonb;
    prev char(64);
    a audit_events%ROWTYPE;
  BEGIN
    SELECT min(seq) INTO first_break FROM (
      SELECT seq, prev_hash IS NOT DISTINCT FROM lag(hash) OVER (ORDER BY seq) AS linked FROM audit_events
    ) chain WHERE NOT linked;
    SELECT min(seq) INTO altered FROM audit_events e WHERE audit_event_digest(e.prev_hash, e) <> e.hash;
    IF first_break IS NOT NULL AND altered IS NULL THEN
      SELECT jsonb_agg(jsonb_build_array(id, prev_hash, hash) ORDER BY seq) INTO legacy FROM audit_events WHERE seq >= first_break;
      SELECT hash INTO prev FROM audit_events WHERE seq = first_break - 1;
      FOR a IN SELECT * FROM audit_events WHERE seq >= first_break ORDER BY seq LOOP
        a.prev_hash := prev;
        a.hash := audit_event_digest(prev, a);
        UPDATE audit_events SET prev_hash = a.prev_hash, hash = a.hash WHERE id = a.id;
        prev := a.hash;
      END LOOP;
    END IF;

    INSERT INTO audit_chain_head (seq, hash)
      SELECT coalesce(max(seq), 0), (SELECT hash FROM audit_events ORDER BY seq DESC LIMIT 1) FROM audit_events;

    IF legacy IS NOT NULL THEN
      INSERT INTO audit_events (actor_email, action, entity_type, before, after)
      VALUES ('system', 'audit.chain-rebased', 'audit', jsonb_build_object('relinked', legacy),
              jsonb_build_object('fromSeq', first_break, 'rows', jsonb_array_length(legacy),
                                 'reason', 'rows written concurrently were linked to a row other than the one before them; re-linked in id order'));
    END IF;
  END $$;

  ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_rewrite;
  ALTER TABLE audit_events ALTER COLUMN seq SET NOT NULL;
  CREATE UNIQUE INDEX audit_events_seq ON audit_events (seq);

  -- Only the chain trigger moves the head; a direct write would let the next row link anywhere.
  CREATE FUNCTION audit_chain_head_guard() RETURNS trigger LANGUAGE plpgsql AS $$
  BEGIN
    IF TG_OP = 'UPDATE' AND pg_trigger_depth() > 1 THEN
      RETURN NEW;
    END IF;
    RAISE EXCEPTION 'audit_chain_head is moved only by inserting audit events: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
  END $$;
  CREATE TRIGGER audit_chain_head_guard BEFORE INSERT OR UPDATE OR DELETE ON audit_chain_head FOR EACH ROW EXECUTE FUNCTION audit_chain_head_guard();
  CREATE TRIGGER audit_chain_head_no_truncate BEFORE TRUNCATE ON audit_chain_head FOR EACH STATEMENT EXECUTE FUNCTION audit_chain_head_guard();
`;

export const DOWN = `
  CREATE OR REPLACE FUNCTION audit_events_chain() RETURNS trigger LANGUAGE plpgsql AS $$
  BEGIN
    PERFORM pg_advisory_xact_lock(4870001);
    SELECT hash INTO NEW.prev_hash FROM audit_events ORDER BY id DESC LIMIT 1;
    NEW.hash := audit_event_digest(NEW.prev_hash, NEW);
    RETURN NEW;
  END $$;
  DROP TABLE audit_chain_head;
  DROP FUNCTION audit_chain_head_guard();
  ALTER TABLE audit_events DROP COLUMN seq;
`;

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(UP);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(DOWN);
};
