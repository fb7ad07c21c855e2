// A lot's plan kept one letter, under the name code_letter: the row the table's arrow leads to. That
// column becomes plan_letter, and code_letter now holds Table 1's sample size code letter of the lot
// size at the inspection level, recomputed for every existing plan. Plans themselves are unchanged.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { INSPECTION_LEVELS, codeLetterFor, type InspectionLevel } from '../../shared/sampling';
import type { Migration } from '../migrator';

export async function addTableCodeLetter(sequelize: Sequelize, transaction: Transaction) {
  await sequelize.query(
    `ALTER TABLE lot_inspections RENAME COLUMN code_letter TO plan_letter;
     ALTER TABLE lot_inspections ADD COLUMN code_letter char(1);`,
    { transaction },
  );
  const plans = await sequelize.query<{ id: number; lotSize: number; level: string }>(
    `SELECT li.id, l.quantity AS "lotSize", li.inspection_level AS level
       FROM lot_inspections li JOIN lots l ON l.id = li.lot_id ORDER BY li.id`,
    { type: QueryTypes.SELECT, transaction },
  );
  const letters = plans.map(({ id, lotSize, level }) => {
    if (!(INSPECTION_LEVELS as readonly string[]).includes(level)) throw new Error(`lot plan ${id} has an unknown inspection level "${level}"`);
    return codeLetterFor(lotSize, level as InspectionLevel);
  });
  if (plans.length > 0) {
    await sequelize.query(
      `UPDATE lot_inspections li SET code_letter = v.letter
         FROM unnest(ARRAY[:ids]::integer[], ARRAY[:letters]::text[]) AS v(id, letter)
        WHERE li.id = v.id`,
      { transaction, replacements: { ids: plans.map((plan) => plan.id), letters } },
    );
  }
  await sequelize.query('ALTER TABLE lot_inspections ALTER COLUMN code_letter SET NOT NULL', { transaction });
}

export async function dropTableCodeLetter(sequelize: Sequelize, transaction: Transaction) {
  await sequelize.query(
    `ALTER TABLE lot_inspections DROP COLUMN code_letter;
     ALTER TABLE lot_inspections RENAME COLUMN plan_letter TO code_letter;`,
    { transaction },
  );
}

export const up: Migration = ({ sequelize }) => sequelize.transaction((transaction) => addTableCodeLetter(sequelize, transaction));

export const down: Migration = ({ sequelize }) => sequelize.transaction((transaction) => dropTableCodeLetter(sequelize, transaction));
