// Nonconformance reports (NCRs): a site-editable catalogue of defect codes, the report with its
// pieces and defect codes, the signed per-piece dispositions, the return-to-vendor shipments (RMA)
// and the link from a replacement shipment back to the NCR it replaces pieces for. Numbers are
// given per calendar year (NCR-2026-0001) from a counter row locked by the transaction that takes one.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE record_counters (
      series varchar(20) NOT NULL,
      year integer NOT NULL,
      last integer NOT NULL CHECK (last > 0),
      PRIMARY KEY (series, year)
    );

    CREATE TABLE defect_codes (
      id serial PRIMARY KEY,
      code varchar(30) NOT NULL UNIQUE CHECK (code ~ '^[a-z0-9][a-z0-9-]*$'),
      label varchar(120) NOT NULL,
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    INSERT INTO defect_codes (code, label) VALUES
      ('retardance', 'Retardance out of tolerance'),
      ('axis-mark', 'Fast-axis mark error'),
      ('mark-on-slow-axis', 'Fast-axis mark on the slow axis'),
      ('wrong-order', 'Wrong order (part, wavelength or order of the plate)'),
      ('diattenuation', 'Diattenuation'),
      ('cosmetic', 'Cosmetic (scratch, dig, coating)'),
      ('dimensional', 'Dimensional'),
      ('documentation', 'Documentation');

    CREATE TABLE nonconformances (
      id serial PRIMARY KEY,
      number varchar(20) NOT NULL UNIQUE,
      origin varchar(20) NOT NULL CHECK (origin IN ('rejection', 'sort', 'accepted-lot', 'found-later')),
      supplier_id integer NOT NULL REFERENCES suppliers(id),
      part_id integer NOT NULL REFERENCES parts(id),
      lot_id integer REFERENCES lots(id),
      lot_disposition_id integer REFERENCES dispositions(id),
      description text NOT NULL,
      containment text NOT NULL DEFAULT '',
      owner_id integer REFERENCES users(id),
      status varchar(14) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'dispositioned', 'closed')),
      opened_by integer REFERENCES users(id),
      opened_at timestamptz NOT NULL DEFAULT now(),
      closed_by integer REFERENCES users(id),
      closed_at timestamptz,
      closing_note text,
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((status = 'closed') = (closed_at IS NOT NULL)),
      CHECK (origin = 'found-later' OR lot_id IS NOT NULL)
    );
    CREATE INDEX nonconformances_supplier ON nonconformances (supplier_id, part_id);
    CREATE INDEX nonconformances_lot ON nonconformances (lot_id);
    CREATE INDEX nonconformances_status ON nonconformances (status);
    -- One automatic NCR per lot decision, so a retried or replayed decision never opens a second one.
    CREATE UNIQUE INDEX nonconformances_one_per_decision ON nonconformances (lot_disposition_id) WHERE lot_disposition_id IS NOT NULL;

    CREATE TABLE nonconformance_defects (
      nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
      defect_code_id integer NOT NULL REFERENCES defect_codes(id),
      PRIMARY KEY (nonconformance_id, defect_code_id)
    );

    CREATE TABLE ncr_dispositions (
      id serial PRIMARY KEY,
      nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
      decision varchar(20) NOT NULL CHECK (decision IN ('return-to-vendor', 'scrap', 'rework', 'use-as-is')),
      meaning text NOT NULL,
      deviation_number varchar(60),
      justification text,
      note text,
      signer_id integer NOT NULL REFERENCES users(id),
      signed_at timestamptz NOT NULL DEFAULT now(),
      CHECK (decision <> 'use-as-is' OR (deviation_number IS NOT NULL AND justification IS NOT NULL))
    );
    CREATE INDEX ncr_dispositions_ncr ON ncr_dispositions (nonconformance_id);

    CREATE TABLE vendor_returns (
      id serial PRIMARY KEY,
      nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
      rma_number varchar(40) NOT NULL,
      ship_date date NOT NULL,
      carrier varchar(80) NOT NULL,
      tracking varchar(80) NOT NULL DEFAULT '',
      remedy varchar(12) NOT NULL CHECK (remedy IN ('credit', 'replacement')),
      credit_amount numeric(12, 2) CHECK (credit_amount >= 0),
      note text NOT NULL DEFAULT '',
      created_by integer NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      CHECK (remedy = 'credit' OR credit_amount IS NULL)
    );
    CREATE INDEX vendor_returns_ncr ON vendor_returns (nonconformance_id);

    CREATE TABLE nonconformance_pieces (
      nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
      piece_id integer NOT NULL REFERENCES pieces(id),
      -- The failing reasons of the piece's verdict when the NCR opened (or what was found, by hand).
      reasons jsonb NOT NULL DEFAULT '[]',
      disposition_id integer REFERENCES ncr_dispositions(id),
      return_id integer REFERENCES vendor_returns(id),
      PRIMARY KEY (nonconformance_id, piece_id)
    );
    CREATE INDEX nonconformance_pieces_piece ON nonconformance_pieces (piece_id);
    -- A piece ships back once.
    CREATE UNIQUE INDEX nonconformance_pieces_returned_once ON nonconformance_pieces (piece_id) WHERE return_id IS NOT NULL;

    ALTER TABLE shipments ADD COLUMN replacement_for_ncr_id integer REFERENCES nonconformances(id);
    CREATE INDEX shipments_replacement_for ON shipments (replacement_for_ncr_id) WHERE replacement_for_ncr_id IS NOT NULL;
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE shipments DROP COLUMN replacement_for_ncr_id;
    DROP TABLE nonconformance_pieces, vendor_returns, ncr_dispositions, nonconformance_defects, nonconformances, defect_codes, record_counters;
  `);
};
