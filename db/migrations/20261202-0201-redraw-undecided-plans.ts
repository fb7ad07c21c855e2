// Lots not yet decided get their plan and sample redrawn from the corrected sampling tables, at the
// severity they were sampled under; the plan they had is kept, with its sample, in
// superseded_lot_plans and the change is audited. Decided lots, their documents and the switching
// history stay as signed.
//
// The sample keeps its seed, so the new sample contains the old one or lies within it (drawSample
// takes the first n pieces of one seeded shuffle): pieces already measured stay in the sample as far
// as the new size allows. A lot under inspection is afterwards awaiting its disposition only if its
// new sample decides it.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { proposeLotVerdict, type PieceVerdict } from '../../shared/inspection/lotVerdict';
import { drawSample, planFor } from '../../shared/sampling';
import type { Migration } from '../migrator';

export const REDRAW_REASON =
  'Sampling tables corrected: tightened plans per ISO 2859-1 Table 2-B and reduced plans per ANSI/ASQ Z1.4 Table II-C; the plan was redrawn before the lot was decided';

export async function createPlanHistory(sequelize: Sequelize, transaction: Transaction) {
  await sequelize.query(
    `CREATE TABLE superseded_lot_plans (
       id serial PRIMARY KEY,
       lot_id integer NOT NULL REFERENCES lots(id),
       inspection_id integer NOT NULL REFERENCES lot_inspections(id),
       plan jsonb NOT NULL,
       sample jsonb NOT NULL,
       reason text NOT NULL,
       superseded_at timestamptz NOT NULL DEFAULT now()
     );
     CREATE INDEX superseded_lot_plans_lot ON superseded_lot_plans (lot_id);`,
    { transaction },
  );
}

type StoredPlan = {
  inspectionId: number;
  lotId: number;
  state: string;
  quantity: number;
  ordered100: boolean;
  severity: string;
  level: string;
  aql: number;
  codeLetter: string;
  planLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
  hundredPercent: boolean;
  seed: string;
};

const planOf = (p: Pick<StoredPlan, 'codeLetter' | 'planLetter' | 'sampleSize' | 'accept' | 'reject' | 'hundredPercent'>) => ({
  codeLetter: p.codeLetter,
  planLetter: p.planLetter,
  sampleSize: p.sampleSize,
  accept: p.accept,
  reject: p.reject,
  hundredPercent: p.hundredPercent,
});

/** Redraws every undecided lot's plan that the tables now give differently; answers those lots. */
export async function redrawUndecidedPlans(sequelize: Sequelize, transaction: Transaction): Promise<number[]> {
  const select = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
    sequelize.query<T>(sql, { type: QueryTypes.SELECT, transaction, replacements });
  const run = (sql: string, replacements: Record<string, unknown>) => sequelize.query(sql, { transaction, replacements });
  const plans = await select<StoredPlan>(
    `SELECT li.id AS "inspectionId", l.id AS "lotId", l.state, l.quantity, pol.hundred_percent AS "ordered100", li.severity, li.inspection_level AS level,
            li.aql::float8 AS aql, li.code_letter AS "codeLetter", li.plan_letter AS "planLetter", li.sample_size AS "sampleSize",
            li.accept_number AS accept, li.reject_number AS reject, li.hundred_percent AS "hundredPercent", li.sample_seed AS seed
       FROM lot_inspections li JOIN lots l ON l.id = li.lot_id JOIN purchase_order_lines pol ON pol.id = l.po_line_id
      WHERE l.state IN ('quarantine', 'inspection', 'awaiting-disposition') AND NOT EXISTS (SELECT 1 FROM dispositions d WHERE d.lot_id = l.id)
      ORDER BY l.id
        FOR UPDATE OF li, l`,
  );
  const redrawn: number[] = [];
  for (const old of plans) {
    // In the order the plan was first drawn in: the lot's pieces by serial.
    const pieces = await select<{ id: number; serial: string }>('SELECT id, serial FROM pieces WHERE lot_id = :lotId ORDER BY serial', { lotId: old.lotId });
    const table = planFor({ lotSize: old.quantity, level: old.level, aql: old.aql, severity: old.severity });
    const hundredPercent = old.ordered100 || table.hundredPercent;
    const next = planOf({ ...table, sampleSize: hundredPercent ? pieces.length : table.sampleSize, hundredPercent });
    if (JSON.stringify(next) === JSON.stringify(planOf(old))) continue;

    const oldSample = await select<{ serial: string }>(
      'SELECT p.serial FROM sample_pieces sp JOIN pieces p ON p.id = sp.piece_id WHERE sp.inspection_id = :id ORDER BY p.serial',
      { id: old.inspectionId },
    );
    const before = { ...planOf(old), severity: old.severity, level: old.level, aql: old.aql, seed: old.seed };
    await run('INSERT INTO superseded_lot_plans (lot_id, inspection_id, plan, sample, reason) VALUES (:lotId, :id, :plan::jsonb, :sample::jsonb, :reason)', {
      lotId: old.lotId,
      id: old.inspectionId,
      plan: JSON.stringify(before),
      sample: JSON.stringify(oldSample.map((s) => s.serial)),
      reason: REDRAW_REASON,
    });
    await run(
      `UPDATE lot_inspections SET code_letter = :codeLetter, plan_letter = :planLetter, sample_size = :sampleSize, accept_number = :accept,
              reject_number = :reject, hundred_percent = :hundredPercent WHERE id = :id`,
      { ...next, id: old.inspectionId },
    );
    const serials = pieces.map((p) => p.serial);
    const chosen = new Set(next.hundredPercent ? serials : drawSample(serials, next.sampleSize, old.seed));
    const sample = pieces.filter((p) => chosen.has(p.serial));
    await run('DELETE FROM sample_pieces WHERE inspection_id = :id', { id: old.inspectionId });
    await run('INSERT INTO sample_pieces (inspection_id, piece_id) SELECT :id, unnest(ARRAY[:pieces]::integer[])', {
      id: old.inspectionId,
      pieces: sample.map((p) => p.id),
    });

    let state = old.state;
    if (old.state !== 'quarantine') {
      const results = await select<{ pieceId: number; verdict: PieceVerdict }>(
        `SELECT piece_id AS "pieceId", verdict FROM piece_results
          WHERE piece_id IN (:pieces) AND superseded_by_file_id IS NULL AND (result->>'judged') IS DISTINCT FROM 'false'`,
        { pieces: sample.map((p) => p.id) },
      );
      const verdict = proposeLotVerdict(
        sample.map((p) => ({ serial: p.serial, verdicts: results.filter((r) => r.pieceId === p.id).map((r) => r.verdict) })),
        { accept: next.accept, reject: next.reject },
      );
      state = verdict.proposal === 'undecided' ? 'inspection' : 'awaiting-disposition';
      if (state !== old.state) await run('UPDATE lots SET state = :state, updated_at = now() WHERE id = :lotId', { state, lotId: old.lotId });
    }
    await run(
      `INSERT INTO audit_events (actor_id, actor_email, actor_roles, action, entity_type, entity_id, before, after)
       VALUES (NULL, 'system', '{}', 'lot.plan-redrawn', 'lot', :lotId, :before::jsonb, :after::jsonb)`,
      {
        lotId: String(old.lotId),
        before: JSON.stringify({ plan: before, sample: oldSample.map((s) => s.serial), state: old.state }),
        after: JSON.stringify({
          plan: { ...next, severity: old.severity, level: old.level, aql: old.aql, seed: old.seed },
          sample: sample.map((p) => p.serial),
          state,
          reason: REDRAW_REASON,
        }),
      },
    );
    redrawn.push(old.lotId);
  }
  return redrawn;
}

export const up: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await createPlanHistory(sequelize, transaction);
    await redrawUndecidedPlans(sequelize, transaction);
  });

export const down: Migration = async ({ sequelize }) => {
  // The corrected plans stay: the tables they came from are the ones in force.
  await sequelize.query('DROP TABLE superseded_lot_plans');
};
