// The pieces each signed NCR act covered. A piece's current disposition stays on its NCR row; a piece
// held for rework may be dispositioned again (scrap, return), so the acts themselves keep their pieces.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE ncr_disposition_pieces (
      disposition_id integer NOT NULL REFERENCES ncr_dispositions(id),
      piece_id integer NOT NULL REFERENCES pieces(id),
      PRIMARY KEY (disposition_id, piece_id)
    );
    INSERT INTO ncr_disposition_pieces (disposition_id, piece_id)
      SELECT disposition_id, piece_id FROM nonconformance_pieces WHERE disposition_id IS NOT NULL
      UNION SELECT rework_release_id, piece_id FROM nonconformance_pieces WHERE rework_release_id IS NOT NULL;
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query('DROP TABLE ncr_disposition_pieces');
};
