// The switching history becomes the sequence the state is recomputed from: each event is a lot's
// result (with the site's reduced-inspection setting at its decision), a signed resumption after
// discontinuation, or a signed severity override, at a position in the supplier-part's sequence. A
// superseding decision adds a new lot event at the position of the one it replaces, which is marked
// superseded and kept. Existing events were lots' first decisions: their results are filled in from
// the signed disposition and the lot's plan, as they were fed at the time (accepted = the sample
// accepted the lot), and the stored states stay as they are.
import type { Sequelize, Transaction } from 'sequelize';
import type { Migration } from '../migrator';

export async function sequenceSwitchingEvents(sequelize: Sequelize, transaction: Transaction) {
  await sequelize.query(
    `
    ALTER TABLE switching_events
      ALTER COLUMN lot_id DROP NOT NULL,
      ADD COLUMN kind varchar(10) NOT NULL DEFAULT 'lot' CHECK (kind IN ('lot', 'resume', 'override')),
      ADD COLUMN position integer,
      ADD COLUMN result jsonb,
      ADD COLUMN reduced_enabled boolean,
      ADD COLUMN disposition_id integer REFERENCES dispositions(id),
      ADD COLUMN severity varchar(10) CHECK (severity IN ('normal', 'tightened', 'reduced')),
      ADD COLUMN reason text,
      ADD COLUMN reference varchar(80),
      ADD COLUMN actor_id integer REFERENCES users(id),
      ADD COLUMN superseded_at timestamptz;

    UPDATE switching_events e SET position = numbered.position
    FROM (SELECT id, row_number() OVER (PARTITION BY supplier_id, part_id ORDER BY id) AS position FROM switching_events) numbered
    WHERE numbered.id = e.id;
    UPDATE switching_events e SET
      disposition_id = d.id,
      actor_id = d.signer_id,
      reduced_enabled = coalesce((SELECT (value->>'reducedInspectionEnabled')::boolean FROM site_settings), false),
      result = jsonb_build_object(
        'accepted', d.lot_verdict->>'proposal' = 'accept',
        'defectives', (d.lot_verdict->>'defectives')::int,
        'plan', jsonb_build_object(
          'planLetter', li.plan_letter, 'sampleSize', li.sample_size, 'accept', li.accept_number, 'reject', li.reject_number,
          'severity', li.severity, 'aql', li.aql::float8, 'level', li.inspection_level))
    FROM dispositions d, lot_inspections li
    WHERE d.lot_id = e.lot_id AND d.supersedes_id IS NULL AND li.lot_id = e.lot_id;

    ALTER TABLE switching_events
      ALTER COLUMN position SET NOT NULL,
      ALTER COLUMN kind DROP DEFAULT,
      ADD CONSTRAINT switching_events_lot CHECK (kind <> 'lot' OR (lot_id IS NOT NULL AND result IS NOT NULL AND reduced_enabled IS NOT NULL)),
      ADD CONSTRAINT switching_events_resume CHECK (kind <> 'resume' OR (reason IS NOT NULL AND actor_id IS NOT NULL)),
      ADD CONSTRAINT switching_events_override CHECK (kind <> 'override' OR (severity IS NOT NULL AND reason IS NOT NULL AND actor_id IS NOT NULL));
    CREATE UNIQUE INDEX switching_events_position ON switching_events (supplier_id, part_id, position) WHERE superseded_at IS NULL;
    CREATE UNIQUE INDEX switching_events_current_lot ON switching_events (lot_id) WHERE superseded_at IS NULL AND kind = 'lot';
  `,
    { transaction },
  );
}

/** Back to lots' first decisions only: resumptions, overrides and superseded results are dropped. */
export async function unsequenceSwitchingEvents(sequelize: Sequelize, transaction: Transaction) {
  await sequelize.query(
    `
    DELETE FROM switching_events WHERE kind <> 'lot' OR superseded_at IS NOT NULL;
    DROP INDEX switching_events_position, switching_events_current_lot;
    ALTER TABLE switching_events
      DROP COLUMN kind, DROP COLUMN position, DROP COLUMN result, DROP COLUMN reduced_enabled, DROP COLUMN disposition_id,
      DROP COLUMN severity, DROP COLUMN reason, DROP COLUMN reference, DROP COLUMN actor_id, DROP COLUMN superseded_at,
      ALTER COLUMN lot_id SET NOT NULL;
  `,
    { transaction },
  );
}

export const up: Migration = ({ sequelize }) => sequelize.transaction((transaction) => sequenceSwitchingEvents(sequelize, transaction));

export const down: Migration = ({ sequelize }) => sequelize.transaction((transaction) => unsequenceSwitchingEvents(sequelize, transaction));
