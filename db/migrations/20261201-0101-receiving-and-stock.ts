// Purchasing, receiving and stock: suppliers, parts, purchase orders with their lines (each line keeps
// a frozen copy of the part's specification), shipments, lots, serialised pieces, locations, the
// attachments that came with a shipment, and the stock ledger. The ledger is append-only and every
// move must leave a piece from where its previous move put it, so on-hand (a count of where pieces
// are) can never go negative or drift.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE suppliers (
      id serial PRIMARY KEY,
      name varchar(120) NOT NULL UNIQUE,
      contact_email varchar(254) NOT NULL,
      owner_id integer REFERENCES users(id),
      notes text NOT NULL DEFAULT '',
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE parts (
      id serial PRIMARY KEY,
      number varchar(40) NOT NULL UNIQUE,
      description varchar(200) NOT NULL,
      spec jsonb NOT NULL,
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE purchase_orders (
      id serial PRIMARY KEY,
      number varchar(30) NOT NULL UNIQUE,
      supplier_id integer NOT NULL REFERENCES suppliers(id),
      buyer_id integer REFERENCES users(id),
      ordered_on date NOT NULL,
      currency char(3) NOT NULL,
      status varchar(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'closed')),
      notes text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX purchase_orders_supplier ON purchase_orders (supplier_id);

    CREATE TABLE purchase_order_lines (
      id serial PRIMARY KEY,
      purchase_order_id integer NOT NULL REFERENCES purchase_orders(id),
      line_number integer NOT NULL CHECK (line_number > 0),
      part_id integer NOT NULL REFERENCES parts(id),
      quantity integer NOT NULL CHECK (quantity > 0),
      unit_price numeric(12, 2) NOT NULL CHECK (unit_price >= 0),
      inspection_level varchar(4) NOT NULL CHECK (inspection_level IN ('S-1', 'S-2', 'S-3', 'S-4', 'I', 'II', 'III')),
      aql numeric(6, 3) NOT NULL CHECK (aql IN (0.065, 0.1, 0.15, 0.25, 0.4, 0.65, 1, 1.5, 2.5, 4, 6.5, 10)),
      hundred_percent boolean NOT NULL DEFAULT false,
      spec jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (purchase_order_id, line_number)
    );
    CREATE INDEX purchase_order_lines_part ON purchase_order_lines (part_id);

    CREATE TABLE shipments (
      id serial PRIMARY KEY,
      purchase_order_id integer NOT NULL REFERENCES purchase_orders(id),
      packing_slip varchar(60) NOT NULL,
      carrier varchar(80) NOT NULL DEFAULT '',
      received_at timestamptz NOT NULL,
      received_by integer REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX shipments_purchase_order ON shipments (purchase_order_id);

    CREATE TABLE lots (
      id serial PRIMARY KEY,
      shipment_id integer NOT NULL REFERENCES shipments(id),
      po_line_id integer NOT NULL REFERENCES purchase_order_lines(id),
      part_id integer NOT NULL REFERENCES parts(id),
      supplier_lot varchar(60) NOT NULL,
      quantity integer NOT NULL CHECK (quantity > 0),
      state varchar(24) NOT NULL DEFAULT 'quarantine'
        CHECK (state IN ('quarantine', 'inspection', 'awaiting-disposition', 'accepted', 'rejected', 'use-as-is')),
      over_receipt_reason text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (id, part_id)
    );
    CREATE INDEX lots_po_line ON lots (po_line_id);
    CREATE INDEX lots_state ON lots (state);

    -- A serial is unique within its part; the lot's part is repeated here to say so in the schema.
    CREATE TABLE pieces (
      id serial PRIMARY KEY,
      lot_id integer NOT NULL,
      part_id integer NOT NULL,
      serial varchar(80) NOT NULL,
      state varchar(12) NOT NULL DEFAULT 'quarantine' CHECK (state IN ('quarantine', 'held', 'in-stock', 'issued', 'returned')),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (lot_id, part_id) REFERENCES lots (id, part_id),
      UNIQUE (part_id, serial)
    );
    CREATE INDEX pieces_lot ON pieces (lot_id);
    CREATE INDEX pieces_serial ON pieces (serial);

    CREATE TABLE locations (
      id serial PRIMARY KEY,
      code varchar(20) NOT NULL UNIQUE,
      name varchar(120) NOT NULL,
      kind varchar(20) NOT NULL CHECK (kind IN ('quarantine', 'inspection-hold', 'stock', 'material-review', 'return-to-vendor')),
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE attachments (
      id serial PRIMARY KEY,
      shipment_id integer NOT NULL REFERENCES shipments(id),
      lot_id integer REFERENCES lots(id),
      kind varchar(20) NOT NULL CHECK (kind IN ('packing-slip', 'certificate')),
      original_name varchar(255) NOT NULL,
      media_type varchar(60) NOT NULL CHECK (media_type IN ('application/pdf', 'image/png', 'image/jpeg')),
      size_bytes integer NOT NULL CHECK (size_bytes > 0),
      sha256 char(64) NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
      uploaded_by integer REFERENCES users(id),
      uploaded_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX attachments_lot ON attachments (lot_id);
    CREATE INDEX attachments_shipment ON attachments (shipment_id);

    CREATE TABLE stock_moves (
      id bigserial PRIMARY KEY,
      piece_id integer NOT NULL REFERENCES pieces(id),
      from_location_id integer REFERENCES locations(id),
      to_location_id integer REFERENCES locations(id),
      reason varchar(20) NOT NULL
        CHECK (reason IN ('receipt', 'inspection', 'release', 'transfer', 'issue', 'return', 'hold', 'return-to-vendor')),
      work_order varchar(40),
      note text,
      actor_id integer REFERENCES users(id),
      moved_at timestamptz NOT NULL DEFAULT now(),
      -- Only a receipt or a return from a work order comes from nowhere; only an issue goes nowhere.
      CHECK ((from_location_id IS NULL) = (reason IN ('receipt', 'return'))),
      CHECK ((to_location_id IS NULL) = (reason = 'issue')),
      CHECK (reason <> 'issue' OR work_order IS NOT NULL),
      CHECK (from_location_id IS DISTINCT FROM to_location_id)
    );
    CREATE INDEX stock_moves_piece ON stock_moves (piece_id, id);
    CREATE INDEX stock_moves_to ON stock_moves (to_location_id);

    -- Where each piece is now: the destination of its latest move (NULL once issued).
    CREATE VIEW piece_locations AS
      SELECT DISTINCT ON (piece_id) piece_id, to_location_id AS location_id, moved_at
      FROM stock_moves ORDER BY piece_id, id DESC;

    CREATE FUNCTION stock_moves_follow_piece() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      previous stock_moves%ROWTYPE;
    BEGIN
      -- Moves of one piece queue behind each other, so two movers never start from the same place.
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

    CREATE FUNCTION stock_moves_refuse_rewrite() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'stock_moves is append-only: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
    END $$;

    CREATE TRIGGER stock_moves_follow_piece BEFORE INSERT ON stock_moves FOR EACH ROW EXECUTE FUNCTION stock_moves_follow_piece();
    CREATE TRIGGER stock_moves_no_rewrite BEFORE UPDATE OR DELETE ON stock_moves FOR EACH ROW EXECUTE FUNCTION stock_moves_refuse_rewrite();
    CREATE TRIGGER stock_moves_no_truncate BEFORE TRUNCATE ON stock_moves FOR EACH STATEMENT EXECUTE FUNCTION stock_moves_refuse_rewrite();
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP VIEW piece_locations;
    DROP TABLE stock_moves, attachments, locations, pieces, lots, shipments, purchase_order_lines, purchase_orders, parts, suppliers;
    DROP FUNCTION stock_moves_follow_piece();
    DROP FUNCTION stock_moves_refuse_rewrite();
  `);
};
