// Inspection: the lot's sampling plan and sample, the bench files with their readings and per-piece
// results, the switching state per supplier and part, and the signed dispositions with the
// documents they issue. Results and dispositions are superseded, never edited.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE lot_inspections (
      id serial PRIMARY KEY,
      lot_id integer NOT NULL UNIQUE REFERENCES lots(id),
      severity varchar(10) NOT NULL CHECK (severity IN ('normal', 'tightened', 'reduced')),
      inspection_level varchar(4) NOT NULL,
      aql numeric(6, 3) NOT NULL,
      code_letter char(1) NOT NULL,
      sample_size integer NOT NULL CHECK (sample_size > 0),
      accept_number integer NOT NULL CHECK (accept_number >= 0),
      reject_number integer NOT NULL CHECK (reject_number > accept_number),
      hundred_percent boolean NOT NULL DEFAULT false,
      sample_seed varchar(64) NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TABLE sample_pieces (
      inspection_id integer NOT NULL REFERENCES lot_inspections(id),
      piece_id integer NOT NULL REFERENCES pieces(id),
      PRIMARY KEY (inspection_id, piece_id)
    );

    CREATE TABLE switching_states (
      supplier_id integer NOT NULL REFERENCES suppliers(id),
      part_id integer NOT NULL REFERENCES parts(id),
      state jsonb NOT NULL,
      updated_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (supplier_id, part_id)
    );
    CREATE TABLE switching_events (
      id serial PRIMARY KEY,
      supplier_id integer NOT NULL REFERENCES suppliers(id),
      part_id integer NOT NULL REFERENCES parts(id),
      lot_id integer NOT NULL REFERENCES lots(id),
      before jsonb NOT NULL,
      after jsonb NOT NULL,
      explanation text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE measurement_files (
      id serial PRIMARY KEY,
      lot_id integer NOT NULL REFERENCES lots(id),
      instrument_id integer NOT NULL REFERENCES instruments(id),
      original_name varchar(255) NOT NULL,
      sha256 char(64) NOT NULL,
      size_bytes integer NOT NULL,
      method varchar(10) NOT NULL,
      metadata jsonb NOT NULL DEFAULT '{}',
      row_count integer NOT NULL,
      warnings jsonb NOT NULL DEFAULT '[]',
      storage_key varchar(80) NOT NULL,
      uploaded_by integer NOT NULL REFERENCES users(id),
      uploaded_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TABLE readings (
      id bigserial PRIMARY KEY,
      file_id integer NOT NULL REFERENCES measurement_files(id),
      line integer NOT NULL,
      serial varchar(80) NOT NULL,
      wavelength_nm numeric(9, 3),
      fields jsonb NOT NULL
    );
    CREATE INDEX readings_file ON readings (file_id);
    CREATE TABLE piece_results (
      id serial PRIMARY KEY,
      piece_id integer NOT NULL REFERENCES pieces(id),
      file_id integer NOT NULL REFERENCES measurement_files(id),
      wavelength_nm numeric(9, 3) NOT NULL,
      verdict varchar(12) NOT NULL CHECK (verdict IN ('pass', 'fail', 'incomplete')),
      result jsonb NOT NULL,
      superseded_by_file_id integer REFERENCES measurement_files(id),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX piece_results_current ON piece_results (piece_id, wavelength_nm) WHERE superseded_by_file_id IS NULL;

    CREATE TABLE dispositions (
      id serial PRIMARY KEY,
      lot_id integer NOT NULL REFERENCES lots(id),
      decision varchar(12) NOT NULL CHECK (decision IN ('accept', 'reject', 'use-as-is')),
      meaning text NOT NULL,
      deviation_number varchar(60),
      justification text,
      lot_verdict jsonb NOT NULL,
      signer_id integer NOT NULL REFERENCES users(id),
      signed_at timestamptz NOT NULL DEFAULT now(),
      supersedes_id integer UNIQUE REFERENCES dispositions(id),
      superseded_at timestamptz,
      CHECK (decision <> 'use-as-is' OR (deviation_number IS NOT NULL AND justification IS NOT NULL))
    );
    CREATE UNIQUE INDEX dispositions_current ON dispositions (lot_id) WHERE superseded_at IS NULL;

    CREATE TABLE lot_documents (
      id serial PRIMARY KEY,
      lot_id integer NOT NULL REFERENCES lots(id),
      disposition_id integer NOT NULL REFERENCES dispositions(id),
      kind varchar(20) NOT NULL CHECK (kind IN ('certificate', 'inspection-report')),
      number varchar(40) NOT NULL UNIQUE,
      data_hash char(64) NOT NULL,
      pdf_sha256 char(64) NOT NULL,
      storage_key varchar(80) NOT NULL,
      issued_at timestamptz NOT NULL DEFAULT now(),
      revoked_at timestamptz
    );
    CREATE SEQUENCE certificate_numbers;
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    DROP SEQUENCE certificate_numbers;
    DROP TABLE lot_documents, dispositions, piece_results, readings, measurement_files, switching_events, switching_states, sample_pieces, lot_inspections;
  `);
};
