// Indexes the lists and pages need at a site's scale (found with EXPLAIN ANALYZE on 100,000 lots):
// - a lot keeps a copy of its shipment's receipt time, set by the database from the shipment, so the
//   lot list and the inspection queue sort on an index of the lots themselves (newest or oldest
//   first, the open lots apart) and join the rest for the rows of the page only;
// - the stock moves in time order (their list shows the latest first);
// - the foreign keys the lot page and the lists join on (lots to shipments and parts; files,
//   decisions and documents to their lot);
// - the audit trail in chain order per kind of record, carrying the time, so a filtered page is read
//   from the index alone.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE lots ADD COLUMN received_at timestamptz;
    UPDATE lots l SET received_at = s.received_at FROM shipments s WHERE s.id = l.shipment_id;
    ALTER TABLE lots ALTER COLUMN received_at SET NOT NULL;

    CREATE FUNCTION lots_take_receipt_time() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      NEW.received_at := (SELECT received_at FROM shipments WHERE id = NEW.shipment_id);
      RETURN NEW;
    END $$;
    CREATE TRIGGER lots_take_receipt_time BEFORE INSERT OR UPDATE OF shipment_id, received_at ON lots
      FOR EACH ROW EXECUTE FUNCTION lots_take_receipt_time();

    CREATE FUNCTION shipments_pass_receipt_time() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE lots SET received_at = NEW.received_at WHERE shipment_id = NEW.id;
      RETURN NULL;
    END $$;
    CREATE TRIGGER shipments_pass_receipt_time AFTER UPDATE OF received_at ON shipments
      FOR EACH ROW WHEN (OLD.received_at IS DISTINCT FROM NEW.received_at) EXECUTE FUNCTION shipments_pass_receipt_time();

    CREATE INDEX lots_received ON lots (received_at, id);
    CREATE INDEX lots_open_received ON lots (received_at, id) WHERE state IN ('quarantine', 'inspection', 'awaiting-disposition', 'sorting');
    CREATE INDEX lots_shipment ON lots (shipment_id);
    CREATE INDEX lots_part ON lots (part_id);
    CREATE INDEX shipments_received ON shipments (received_at, id);
    CREATE INDEX stock_moves_time ON stock_moves (moved_at, id);
    CREATE INDEX measurement_files_lot ON measurement_files (lot_id);
    CREATE INDEX dispositions_lot ON dispositions (lot_id);
    CREATE INDEX lot_documents_lot ON lot_documents (lot_id);
    CREATE INDEX audit_events_type_seq ON audit_events (entity_type, seq) INCLUDE (occurred_at);
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP INDEX audit_events_type_seq, lot_documents_lot, dispositions_lot, measurement_files_lot, stock_moves_time, shipments_received, lots_part, lots_shipment,
      lots_open_received, lots_received;
    DROP TRIGGER shipments_pass_receipt_time ON shipments;
    DROP FUNCTION shipments_pass_receipt_time();
    DROP TRIGGER lots_take_receipt_time ON lots;
    DROP FUNCTION lots_take_receipt_time();
    ALTER TABLE lots DROP COLUMN received_at;
  `);
};
