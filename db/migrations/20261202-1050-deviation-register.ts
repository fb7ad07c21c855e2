// The deviation register: what a supplier's part may deviate by (free text, optionally widened
// tolerances), for how many pieces and until when, approved by a quality manager and a second,
// different approver (quality or admin), each signature stored. Every signed decision that releases
// pieces under a deviation records a use of its quantity; a superseded decision gives it back.
// A use-as-is lot decision now names its register entry. The free-text numbers of use-as-is
// decisions signed before the register become entries "recorded before the register": they keep
// the history readable and can never cover a new decision (no approvals, limit or expiry recorded).
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Migration } from '../migrator';

/** What the register says of an entry made from an earlier decision's free-text number. */
export const EARLIER_ENTRY_NOTE = 'Recorded before the register from the use-as-is decision';

/** Turns the free-text deviation numbers of use-as-is lot decisions not yet tied to the register into
 * register entries (one per number, supplier and part), ties each decision to its entry, records
 * the pieces each decision released as a use (given back when the decision was superseded), and
 * audits each new entry. Answers the ids of the entries made. */
export async function registerEarlierDeviations(sequelize: Sequelize, transaction: Transaction): Promise<number[]> {
  const created = await sequelize.query<{ id: number }>(
    `
    WITH earlier AS (
      SELECT d.id, d.deviation_number, d.justification, d.signed_at, l.id AS lot_id, l.part_id, po.supplier_id
        FROM dispositions d
        JOIN lots l ON l.id = d.lot_id
        JOIN purchase_order_lines pol ON pol.id = l.po_line_id
        JOIN purchase_orders po ON po.id = pol.purchase_order_id
       WHERE d.decision = 'use-as-is' AND d.deviation_id IS NULL
    )
    INSERT INTO deviations (number, supplier_id, part_id, allowed, recorded_before_register, created_at, updated_at)
    SELECT e.deviation_number, e.supplier_id, e.part_id,
           '${EARLIER_ENTRY_NOTE}' || CASE WHEN count(DISTINCT e.lot_id) > 1 THEN 's' ELSE '' END || ' of '
             || string_agg(DISTINCT 'L-' || e.lot_id, ', ' ORDER BY 'L-' || e.lot_id) || '. Justification given: ' || (array_agg(e.justification ORDER BY e.signed_at))[1],
           true, min(e.signed_at), min(e.signed_at)
      FROM earlier e
     WHERE NOT EXISTS (SELECT 1 FROM deviations dv WHERE dv.recorded_before_register AND dv.number = e.deviation_number AND dv.supplier_id = e.supplier_id AND dv.part_id = e.part_id)
     GROUP BY e.deviation_number, e.supplier_id, e.part_id
    RETURNING id`,
    { transaction, type: QueryTypes.SELECT },
  );
  await sequelize.query(
    `UPDATE dispositions d SET deviation_id = dv.id
       FROM lots l, purchase_order_lines pol, purchase_orders po, deviations dv
      WHERE d.decision = 'use-as-is' AND d.deviation_id IS NULL AND l.id = d.lot_id AND pol.id = l.po_line_id AND po.id = pol.purchase_order_id
        AND dv.recorded_before_register AND dv.number = d.deviation_number AND dv.supplier_id = po.supplier_id AND dv.part_id = l.part_id`,
    { transaction },
  );
  await sequelize.query(
    `INSERT INTO deviation_uses (deviation_id, quantity, lot_id, disposition_id, used_at, released_at)
     SELECT d.deviation_id, l.quantity, l.id, d.id, d.signed_at, d.superseded_at
       FROM dispositions d JOIN lots l ON l.id = d.lot_id
      WHERE d.decision = 'use-as-is' AND d.deviation_id IS NOT NULL AND NOT EXISTS (SELECT 1 FROM deviation_uses u WHERE u.disposition_id = d.id)`,
    { transaction },
  );
  for (const entry of created) {
    await sequelize.query(
      `INSERT INTO audit_events (actor_id, actor_email, actor_roles, action, entity_type, entity_id, before, after)
       SELECT NULL, 'system', '{}', 'deviation.recorded-before-register', 'deviation', dv.id::text, NULL,
              jsonb_build_object('number', dv.number, 'supplierId', dv.supplier_id, 'partId', dv.part_id,
                                 'lots', (SELECT jsonb_agg(d.lot_id ORDER BY d.lot_id) FROM dispositions d WHERE d.deviation_id = dv.id))
         FROM deviations dv WHERE dv.id = :id`,
      { transaction, replacements: { id: entry.id } },
    );
  }
  return created.map((entry) => entry.id);
}

export const up: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      CREATE TABLE deviations (
        id serial PRIMARY KEY,
        number varchar(60) NOT NULL,
        supplier_id integer NOT NULL REFERENCES suppliers(id),
        part_id integer NOT NULL REFERENCES parts(id),
        allowed text NOT NULL,
        -- Optional widened tolerances (± waves of retardance, ± degrees of fast-axis mark).
        retardance_tol_waves numeric(8, 5) CHECK (retardance_tol_waves > 0),
        axis_tol_deg numeric(6, 3) CHECK (axis_tol_deg > 0),
        quantity_limit integer CHECK (quantity_limit > 0),
        -- The last day (UTC) on which the deviation may cover a decision.
        expires_on date,
        recorded_before_register boolean NOT NULL DEFAULT false,
        created_by integer REFERENCES users(id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        withdrawn_at timestamptz,
        withdrawn_by integer REFERENCES users(id),
        withdrawal_reason text,
        CHECK (recorded_before_register OR (quantity_limit IS NOT NULL AND expires_on IS NOT NULL AND created_by IS NOT NULL)),
        CHECK ((withdrawn_at IS NULL) = (withdrawal_reason IS NULL))
      );
      CREATE UNIQUE INDEX deviations_number ON deviations (number) WHERE NOT recorded_before_register;
      CREATE UNIQUE INDEX deviations_earlier_number ON deviations (number, supplier_id, part_id) WHERE recorded_before_register;
      CREATE INDEX deviations_supplier_part ON deviations (supplier_id, part_id);

      CREATE TABLE deviation_approvals (
        deviation_id integer NOT NULL REFERENCES deviations(id),
        -- 'quality': the quality manager's approval; 'second': another user's (quality or admin).
        slot varchar(8) NOT NULL CHECK (slot IN ('quality', 'second')),
        approver_id integer NOT NULL REFERENCES users(id),
        meaning text NOT NULL,
        signed_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (deviation_id, slot),
        -- The second approver is another person than the first.
        UNIQUE (deviation_id, approver_id)
      );

      CREATE TABLE deviation_uses (
        id serial PRIMARY KEY,
        deviation_id integer NOT NULL REFERENCES deviations(id),
        quantity integer NOT NULL CHECK (quantity > 0),
        lot_id integer REFERENCES lots(id),
        disposition_id integer UNIQUE REFERENCES dispositions(id),
        ncr_disposition_id integer REFERENCES ncr_dispositions(id),
        used_at timestamptz NOT NULL DEFAULT now(),
        -- Set when the decision that used the deviation is superseded: the quantity is free again.
        released_at timestamptz,
        CHECK (num_nonnulls(disposition_id, ncr_disposition_id) = 1)
      );
      CREATE INDEX deviation_uses_deviation ON deviation_uses (deviation_id);

      ALTER TABLE dispositions ADD COLUMN deviation_id integer REFERENCES deviations(id);
    `,
      { transaction },
    );
    await registerEarlierDeviations(sequelize, transaction);
    await sequelize.query(
      `ALTER TABLE dispositions ADD CONSTRAINT dispositions_deviation_registered CHECK (decision <> 'use-as-is' OR deviation_id IS NOT NULL)`,
      { transaction },
    );
  });

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE dispositions DROP CONSTRAINT dispositions_deviation_registered;
    ALTER TABLE dispositions DROP COLUMN deviation_id;
    DROP TABLE deviation_uses, deviation_approvals, deviations;
  `);
};
