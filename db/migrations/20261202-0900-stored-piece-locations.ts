// Where each piece is, and how many pieces of a part each location holds, kept by the stock ledger
// itself instead of being worked out from the whole ledger on every read.
// - piece_locations becomes a table (same columns as the view it replaces, plus the move that put
//   the piece there), written by the ledger's BEFORE INSERT trigger under the piece's row lock, in
//   the transaction of the move. The trigger now checks a move against this row.
// - on_hand_changes holds signed piece counts per part and location, appended by a statement
//   trigger for each batch of moves (appends take no lock, so concurrent movers never wait on or
//   deadlock over a shared counter); the view on_hand adds them up. A pair's rows are folded into
//   one now and then by whichever transaction finds more than a few and can take the pair's
//   advisory lock without waiting.
// The existing ledger is read once here to fill both.
import type { Migration } from '../migrator';

/** Rows a part and location may gather before a move folds them into one. */
const FOLD_ABOVE = 16;
/** The advisory-lock class of the on-hand folding ('onhd' in ASCII), apart from every other lock. */
const FOLD_LOCK_CLASS = 1869506660;

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP VIEW piece_locations;

    CREATE TABLE piece_locations (
      piece_id integer PRIMARY KEY REFERENCES pieces(id),
      -- NULL once the piece is issued to a work order.
      location_id integer REFERENCES locations(id),
      moved_at timestamptz NOT NULL,
      -- The ledger row that put it there. Not a foreign key: the row is written just before that
      -- ledger row, in the same statement.
      move_id bigint NOT NULL
    );
    CREATE INDEX piece_locations_location ON piece_locations (location_id);
    INSERT INTO piece_locations (piece_id, location_id, moved_at, move_id)
      SELECT DISTINCT ON (piece_id) piece_id, to_location_id, moved_at, id FROM stock_moves ORDER BY piece_id, id DESC;

    CREATE OR REPLACE FUNCTION stock_moves_follow_piece() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      current piece_locations%ROWTYPE;
    BEGIN
      -- Moves of one piece queue behind each other, so two movers never start from the same place.
      PERFORM 1 FROM pieces WHERE id = NEW.piece_id FOR UPDATE;
      SELECT * INTO current FROM piece_locations WHERE piece_id = NEW.piece_id;
      IF NOT FOUND THEN
        IF NEW.reason <> 'receipt' THEN
          RAISE EXCEPTION 'piece % has not been received yet', NEW.piece_id USING ERRCODE = 'check_violation';
        END IF;
        INSERT INTO piece_locations (piece_id, location_id, moved_at, move_id) VALUES (NEW.piece_id, NEW.to_location_id, NEW.moved_at, NEW.id);
      ELSIF NEW.reason = 'receipt' THEN
        RAISE EXCEPTION 'piece % was already received', NEW.piece_id USING ERRCODE = 'check_violation';
      ELSIF NEW.from_location_id IS DISTINCT FROM current.location_id THEN
        RAISE EXCEPTION 'piece % is not where the move starts from', NEW.piece_id USING ERRCODE = 'check_violation';
      ELSE
        UPDATE piece_locations SET location_id = NEW.to_location_id, moved_at = NEW.moved_at, move_id = NEW.id WHERE piece_id = NEW.piece_id;
      END IF;
      -- A failing check or constraint later in the statement rolls this back with the move.
      RETURN NEW;
    END $$;

    CREATE TABLE on_hand_changes (
      id bigserial PRIMARY KEY,
      part_id integer NOT NULL REFERENCES parts(id),
      location_id integer NOT NULL REFERENCES locations(id),
      pieces integer NOT NULL CHECK (pieces <> 0)
    );
    CREATE INDEX on_hand_changes_pair ON on_hand_changes (part_id, location_id);
    CREATE INDEX on_hand_changes_location ON on_hand_changes (location_id);
    INSERT INTO on_hand_changes (part_id, location_id, pieces)
      SELECT p.part_id, pl.location_id, count(*) FROM piece_locations pl JOIN pieces p ON p.id = pl.piece_id
       WHERE pl.location_id IS NOT NULL GROUP BY p.part_id, pl.location_id;

    -- Pieces of each part in each location now.
    CREATE VIEW on_hand AS
      SELECT part_id, location_id, sum(pieces)::integer AS pieces FROM on_hand_changes GROUP BY part_id, location_id HAVING sum(pieces) <> 0;

    CREATE FUNCTION stock_moves_count_on_hand() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      pair record;
    BEGIN
      FOR pair IN
        INSERT INTO on_hand_changes (part_id, location_id, pieces)
        SELECT p.part_id, c.location_id, sum(c.pieces)
          FROM moved m
          JOIN pieces p ON p.id = m.piece_id
          CROSS JOIN LATERAL (VALUES (m.to_location_id, 1), (m.from_location_id, -1)) AS c (location_id, pieces)
         WHERE c.location_id IS NOT NULL
         GROUP BY p.part_id, c.location_id
        HAVING sum(c.pieces) <> 0
        RETURNING part_id, location_id
      LOOP
        -- Folding never waits: a pair another transaction is folding is left to a later move.
        IF (SELECT count(*) FROM on_hand_changes WHERE part_id = pair.part_id AND location_id = pair.location_id) > ${FOLD_ABOVE}
           AND pg_try_advisory_xact_lock(${FOLD_LOCK_CLASS}, hashtext(pair.part_id || ':' || pair.location_id)) THEN
          WITH folded AS (DELETE FROM on_hand_changes WHERE part_id = pair.part_id AND location_id = pair.location_id RETURNING pieces)
          INSERT INTO on_hand_changes (part_id, location_id, pieces)
            SELECT pair.part_id, pair.location_id, sum(pieces) FROM folded HAVING sum(pieces) <> 0;
        END IF;
      END LOOP;
      RETURN NULL;
    END $$;

    CREATE TRIGGER stock_moves_count_on_hand AFTER INSERT ON stock_moves REFERENCING NEW TABLE AS moved
      FOR EACH STATEMENT EXECUTE FUNCTION stock_moves_count_on_hand();
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP TRIGGER stock_moves_count_on_hand ON stock_moves;
    DROP FUNCTION stock_moves_count_on_hand();
    DROP VIEW on_hand;
    DROP TABLE on_hand_changes;

    CREATE OR REPLACE FUNCTION stock_moves_follow_piece() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      previous stock_moves%ROWTYPE;
    BEGIN
      PERFORM 1 FROM pieces WHERE id = NEW.piece_id FOR UPDATE;
      SELECT * INTO previous FROM stock_moves WHERE piece_id = NEW.piece_id ORDER BY id DESC LIMIT 1;
      IF NOT FOUND THEN
        IF NEW.reason <> 'receipt' THEN
          RAISE EXCEPTION 'piece % has not been received yet', NEW.piece_id USING ERRCODE = 'check_violation';
        END IF;
      ELSIF NEW.reason = 'receipt' THEN
        RAISE EXCEPTION 'piece % was already received', NEW.piece_id USING ERRCODE = 'check_violation';
      ELSIF NEW.from_location_id IS DISTINCT FROM previous.to_location_id THEN
        RAISE EXCEPTION 'piece % is not where the move starts from', NEW.piece_id USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END $$;

    DROP TABLE piece_locations;
    CREATE VIEW piece_locations AS
      SELECT DISTINCT ON (piece_id) piece_id, to_location_id AS location_id, moved_at
      FROM stock_moves ORDER BY piece_id, id DESC;
  `);
};
