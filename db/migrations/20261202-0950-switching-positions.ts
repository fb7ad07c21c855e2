// Every signed decision numbers its place in the supplier and part's switching sequence after the
// last one ever given (superseded entries included, so a position is never reused). The index of
// positions covered only current entries, so that look-up read every switching event of the site
// (100,000 on a site's scale: a scan on each signature). This index answers it from the pair's own
// entries.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query('CREATE INDEX switching_events_every_position ON switching_events (supplier_id, part_id, position)');
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query('DROP INDEX switching_events_every_position');
};
