// A fourth signed decision, the 100 % sort, and the two lot states it passes through: 'sorting'
// while the remaining pieces are measured, 'sorted' once each piece has gone by its own verdict.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE lots DROP CONSTRAINT lots_state_check;
    ALTER TABLE lots ADD CONSTRAINT lots_state_check
      CHECK (state IN ('quarantine', 'inspection', 'awaiting-disposition', 'accepted', 'rejected', 'sorting', 'sorted', 'use-as-is'));
    ALTER TABLE dispositions DROP CONSTRAINT dispositions_decision_check;
    ALTER TABLE dispositions ADD CONSTRAINT dispositions_decision_check CHECK (decision IN ('accept', 'reject', 'sort', 'use-as-is'));
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE dispositions DROP CONSTRAINT dispositions_decision_check;
    ALTER TABLE dispositions ADD CONSTRAINT dispositions_decision_check CHECK (decision IN ('accept', 'reject', 'use-as-is'));
    ALTER TABLE lots DROP CONSTRAINT lots_state_check;
    ALTER TABLE lots ADD CONSTRAINT lots_state_check
      CHECK (state IN ('quarantine', 'inspection', 'awaiting-disposition', 'accepted', 'rejected', 'use-as-is'));
  `);
};
