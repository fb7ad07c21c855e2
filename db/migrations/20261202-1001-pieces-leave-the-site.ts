// Nonconforming pieces that leave the site for good: scrapped, or shipped back to the vendor on a
// return (RMA). Both are moves out of stores, like an issue, but to no work order: two new ledger
// reasons with no destination and two new piece states. Such a piece never moves again, which the
// ledger's table itself refuses. A reworked piece comes back into stock by a second signed act of
// the NCR ('rework-release'), which the per-piece record points to.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE stock_moves DROP CONSTRAINT stock_moves_reason_check;
    ALTER TABLE stock_moves ADD CONSTRAINT stock_moves_reason_check
      CHECK (reason IN ('receipt', 'inspection', 'release', 'transfer', 'issue', 'return', 'hold', 'return-to-vendor', 'scrap', 'ship-to-vendor'));
    ALTER TABLE stock_moves DROP CONSTRAINT stock_moves_check1;
    ALTER TABLE stock_moves ADD CONSTRAINT stock_moves_leaves_stores CHECK ((to_location_id IS NULL) = (reason IN ('issue', 'scrap', 'ship-to-vendor')));

    ALTER TABLE pieces DROP CONSTRAINT pieces_state_check;
    ALTER TABLE pieces ADD CONSTRAINT pieces_state_check
      CHECK (state IN ('quarantine', 'held', 'in-stock', 'issued', 'returned', 'scrapped', 'shipped-back'));

    CREATE FUNCTION stock_moves_refuse_gone() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF (SELECT state FROM pieces WHERE id = NEW.piece_id) IN ('scrapped', 'shipped-back') THEN
        RAISE EXCEPTION 'piece % has left the site (scrapped or shipped back to the vendor)', NEW.piece_id USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END $$;
    CREATE TRIGGER stock_moves_refuse_gone BEFORE INSERT ON stock_moves FOR EACH ROW EXECUTE FUNCTION stock_moves_refuse_gone();

    ALTER TABLE ncr_dispositions DROP CONSTRAINT ncr_dispositions_decision_check;
    ALTER TABLE ncr_dispositions ADD CONSTRAINT ncr_dispositions_decision_check
      CHECK (decision IN ('return-to-vendor', 'scrap', 'rework', 'use-as-is', 'rework-release'));
    ALTER TABLE nonconformance_pieces ADD COLUMN rework_release_id integer REFERENCES ncr_dispositions(id);
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE nonconformance_pieces DROP COLUMN rework_release_id;
    ALTER TABLE ncr_dispositions DROP CONSTRAINT ncr_dispositions_decision_check;
    ALTER TABLE ncr_dispositions ADD CONSTRAINT ncr_dispositions_decision_check CHECK (decision IN ('return-to-vendor', 'scrap', 'rework', 'use-as-is'));
    DROP TRIGGER stock_moves_refuse_gone ON stock_moves;
    DROP FUNCTION stock_moves_refuse_gone();
    ALTER TABLE pieces DROP CONSTRAINT pieces_state_check;
    ALTER TABLE pieces ADD CONSTRAINT pieces_state_check CHECK (state IN ('quarantine', 'held', 'in-stock', 'issued', 'returned'));
    ALTER TABLE stock_moves DROP CONSTRAINT stock_moves_leaves_stores;
    ALTER TABLE stock_moves ADD CONSTRAINT stock_moves_check1 CHECK ((to_location_id IS NULL) = (reason = 'issue'));
    ALTER TABLE stock_moves DROP CONSTRAINT stock_moves_reason_check;
    ALTER TABLE stock_moves ADD CONSTRAINT stock_moves_reason_check
      CHECK (reason IN ('receipt', 'inspection', 'release', 'transfer', 'issue', 'return', 'hold', 'return-to-vendor'));
  `);
};
