// A bench file of 120,000 rows writes 120,000 readings and 20,000 results in one statement each.
// Their foreign keys checked every row on its own (one look-up per row: over half the database's
// time of such a commit). The same rules are now checked once per statement: every file and piece
// the new rows name must exist (looked up once per distinct key), the rows never change which file
// or piece they name, and a file or piece that rows name can be neither deleted nor renumbered.
// Violations are reported as foreign-key violations (23503), as before.
import type { Sequelize, Transaction } from 'sequelize';
import type { Migration } from '../migrator';

/** Each checked reference: the child table and column, the parent table, and the constraint it replaces. */
const REFERENCES = [
  { child: 'readings', column: 'file_id', parent: 'measurement_files', constraint: 'readings_file_id_fkey' },
  { child: 'piece_results', column: 'file_id', parent: 'measurement_files', constraint: 'piece_results_file_id_fkey' },
  { child: 'piece_results', column: 'piece_id', parent: 'pieces', constraint: 'piece_results_piece_id_fkey' },
] as const;

export async function checkReferencesPerStatement(sequelize: Sequelize, transaction?: Transaction) {
  for (const { child, column, parent, constraint } of REFERENCES) {
    const name = `${child}_${column}`;
    await sequelize.query(
      `ALTER TABLE ${child} DROP CONSTRAINT ${constraint};

       CREATE FUNCTION ${name}_exists() RETURNS trigger LANGUAGE plpgsql AS $$
       DECLARE missing integer;
       BEGIN
         SELECT a.${column} INTO missing FROM (SELECT DISTINCT ${column} FROM added) a
          WHERE NOT EXISTS (SELECT 1 FROM ${parent} p WHERE p.id = a.${column}) LIMIT 1;
         IF FOUND THEN
           RAISE EXCEPTION 'insert into ${child} names ${parent} id %, which does not exist', missing USING ERRCODE = 'foreign_key_violation';
         END IF;
         RETURN NULL;
       END $$;
       CREATE TRIGGER ${name}_exists AFTER INSERT ON ${child} REFERENCING NEW TABLE AS added
         FOR EACH STATEMENT EXECUTE FUNCTION ${name}_exists();

       CREATE FUNCTION ${name}_unchanged() RETURNS trigger LANGUAGE plpgsql AS $$
       BEGIN
         IF NEW.${column} IS DISTINCT FROM OLD.${column} THEN
           RAISE EXCEPTION 'a row of ${child} keeps the ${parent} it names' USING ERRCODE = 'foreign_key_violation';
         END IF;
         RETURN NEW;
       END $$;
       CREATE TRIGGER ${name}_unchanged BEFORE UPDATE OF ${column} ON ${child}
         FOR EACH ROW EXECUTE FUNCTION ${name}_unchanged();

       CREATE FUNCTION ${name}_kept() RETURNS trigger LANGUAGE plpgsql AS $$
       BEGIN
         IF (TG_OP = 'DELETE' OR NEW.id IS DISTINCT FROM OLD.id) AND EXISTS (SELECT 1 FROM ${child} WHERE ${column} = OLD.id) THEN
           RAISE EXCEPTION '${parent} id % is still named by ${child}', OLD.id USING ERRCODE = 'foreign_key_violation';
         END IF;
         RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
       END $$;
       CREATE TRIGGER ${name}_kept BEFORE DELETE OR UPDATE OF id ON ${parent}
         FOR EACH ROW EXECUTE FUNCTION ${name}_kept();`,
      { transaction },
    );
  }
}

export async function checkReferencesPerRow(sequelize: Sequelize, transaction?: Transaction) {
  for (const { child, column, parent, constraint } of REFERENCES) {
    const name = `${child}_${column}`;
    await sequelize.query(
      `DROP TRIGGER ${name}_kept ON ${parent};
       DROP TRIGGER ${name}_unchanged ON ${child};
       DROP TRIGGER ${name}_exists ON ${child};
       DROP FUNCTION ${name}_kept(), ${name}_unchanged(), ${name}_exists();
       ALTER TABLE ${child} ADD CONSTRAINT ${constraint} FOREIGN KEY (${column}) REFERENCES ${parent}(id);`,
      { transaction },
    );
  }
}

export const up: Migration = ({ sequelize }) => checkReferencesPerStatement(sequelize);

export const down: Migration = ({ sequelize }) => checkReferencesPerRow(sequelize);
