// NCRs for lots decided before nonconformance reports existed, as the decision would open them now:
// a rejected lot (its pieces in return-to-vendor), a completed 100 % sort (the nonconforming pieces
// it sent to return-to-vendor) and an accepted lot whose failed sample pieces wait in material review.
// Each NCR is numbered in the year its decision was signed, owned by the decision's signer, lists the
// pieces with their failing reasons and the defect codes those reasons name, and is audited. The
// catalogue also gains a code for depolarisation, which the engine judges too.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { defectCodesFor } from '../../shared/nonconformance/defectCodes';
import { describeLotNcr, failingReasons, type LotNcrFacts } from '../../shared/nonconformance/automatic';
import type { Migration } from '../migrator';

type Decided = {
  dispositionId: number;
  decision: 'accept' | 'reject' | 'sort';
  signerId: number;
  signedAt: Date;
  explanation: string;
  lotId: number;
  supplierLot: string;
  partId: number;
  partNumber: string;
  supplierId: number;
  supplierName: string;
  poNumber: string;
};
type SetAside = { pieceId: number; locationCode: string; results: { wavelengthNm: number; verdict: string; reasons: string[] }[] | null };

const ORIGIN = { reject: 'rejection', sort: 'sort', accept: 'accepted-lot' } as const;
const HELD_IN = { reject: 'return-to-vendor', sort: 'return-to-vendor', accept: 'material-review' } as const;

async function nextNumber(sequelize: Sequelize, year: number, transaction: Transaction) {
  const [{ last }] = await sequelize.query<{ last: number }>(
    `INSERT INTO record_counters (series, year, last) VALUES ('NCR', :year, 1)
     ON CONFLICT (series, year) DO UPDATE SET last = record_counters.last + 1 RETURNING last`,
    { type: QueryTypes.SELECT, transaction, replacements: { year } },
  );
  return `NCR-${year}-${String(last).padStart(4, '0')}`;
}

/** Opens the NCRs; answers their ids. */
export async function openNcrsForEarlierDecisions(sequelize: Sequelize, transaction: Transaction): Promise<number[]> {
  const decided = await sequelize.query<Decided>(
    `SELECT d.id AS "dispositionId", d.decision, d.signer_id AS "signerId", d.signed_at AS "signedAt", coalesce(d.lot_verdict->>'explanation', '') AS explanation,
            l.id AS "lotId", l.supplier_lot AS "supplierLot", l.part_id AS "partId", p.number AS "partNumber", po.supplier_id AS "supplierId",
            s.name AS "supplierName", po.number AS "poNumber"
       FROM dispositions d
       JOIN lots l ON l.id = d.lot_id
       JOIN parts p ON p.id = l.part_id
       JOIN purchase_order_lines pol ON pol.id = l.po_line_id
       JOIN purchase_orders po ON po.id = pol.purchase_order_id
       JOIN suppliers s ON s.id = po.supplier_id
      WHERE d.superseded_at IS NULL
        AND ((d.decision = 'reject' AND l.state = 'rejected') OR (d.decision = 'sort' AND l.state = 'sorted') OR (d.decision = 'accept' AND l.state = 'accepted'))
        AND NOT EXISTS (SELECT 1 FROM nonconformances n WHERE n.lot_disposition_id = d.id)
      ORDER BY d.signed_at, d.id`,
    { type: QueryTypes.SELECT, transaction },
  );
  const opened: number[] = [];
  const codes = new Map(
    (await sequelize.query<{ id: number; code: string }>('SELECT id, code FROM defect_codes', { type: QueryTypes.SELECT, transaction })).map((c) => [
      c.code,
      c.id,
    ]),
  );
  for (const lot of decided) {
    const pieces = await sequelize.query<SetAside>(
      `SELECT pc.id AS "pieceId", loc.code AS "locationCode",
              (SELECT jsonb_agg(jsonb_build_object('wavelengthNm', r.wavelength_nm, 'verdict', r.verdict, 'reasons', r.result->'reasons') ORDER BY r.wavelength_nm)
                 FROM piece_results r WHERE r.piece_id = pc.id AND r.superseded_by_file_id IS NULL AND coalesce((r.result->>'judged')::boolean, true)) AS results
         FROM pieces pc JOIN piece_locations pl ON pl.piece_id = pc.id JOIN locations loc ON loc.id = pl.location_id
        WHERE pc.lot_id = :lotId AND loc.kind = :kind
        ORDER BY pc.id`,
      { type: QueryTypes.SELECT, transaction, replacements: { lotId: lot.lotId, kind: HELD_IN[lot.decision] } },
    );
    if (pieces.length === 0) continue;
    const reasons = pieces.map((p) => failingReasons((p.results ?? []).map((r) => ({ ...r, wavelengthNm: Number(r.wavelengthNm) }))));
    const facts: LotNcrFacts = {
      origin: ORIGIN[lot.decision],
      lotName: `L-${lot.lotId}`,
      partNumber: lot.partNumber,
      supplierName: lot.supplierName,
      supplierLot: lot.supplierLot,
      poNumber: lot.poNumber,
      explanation: lot.explanation,
      pieces: pieces.length,
      failing: reasons.filter((r) => r.length > 0).length,
      heldAt: [...new Set(pieces.map((p) => p.locationCode))].join(', '),
    };
    const { description, containment } = describeLotNcr(facts);
    const number = await nextNumber(sequelize, new Date(lot.signedAt).getUTCFullYear(), transaction);
    const [{ id }] = await sequelize.query<{ id: number }>(
      `INSERT INTO nonconformances (number, origin, supplier_id, part_id, lot_id, lot_disposition_id, description, containment, owner_id, opened_by, opened_at, updated_at)
       VALUES (:number, :origin, :supplierId, :partId, :lotId, :dispositionId, :description, :containment, :signerId, :signerId, :signedAt, :signedAt) RETURNING id`,
      { type: QueryTypes.SELECT, transaction, replacements: { ...lot, number, origin: facts.origin, description, containment } },
    );
    for (const [index, piece] of pieces.entries()) {
      await sequelize.query('INSERT INTO nonconformance_pieces (nonconformance_id, piece_id, reasons) VALUES (:id, :pieceId, :reasons)', {
        transaction,
        replacements: { id, pieceId: piece.pieceId, reasons: JSON.stringify(reasons[index]) },
      });
    }
    const defects = defectCodesFor(reasons.flat()).filter((code) => codes.has(code));
    for (const code of defects) {
      await sequelize.query('INSERT INTO nonconformance_defects (nonconformance_id, defect_code_id) VALUES (:id, :codeId)', {
        transaction,
        replacements: { id, codeId: codes.get(code) },
      });
    }
    await sequelize.query(
      `INSERT INTO audit_events (actor_id, actor_email, actor_roles, action, entity_type, entity_id, before, after)
       VALUES (NULL, 'system', '{}', 'ncr.opened-for-earlier-decision', 'nonconformance', :id, NULL, :after)`,
      {
        transaction,
        replacements: {
          id: String(id),
          after: JSON.stringify({ number, origin: facts.origin, lot: facts.lotName, dispositionId: lot.dispositionId, pieces: pieces.length, defects }),
        },
      },
    );
    opened.push(id);
  }
  return opened;
}

export const up: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `INSERT INTO defect_codes (code, label) VALUES ('depolarisation', 'Depolarisation (scatter, strain)') ON CONFLICT (code) DO NOTHING`,
      { transaction },
    );
    await openNcrsForEarlierDecisions(sequelize, transaction);
  });

// Removes the NCRs this migration opened, as long as nothing was done on them since.
export const down: Migration = ({ sequelize }) =>
  sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `CREATE TEMP TABLE earlier_ncrs ON COMMIT DROP AS
         SELECT n.id FROM nonconformances n
          WHERE n.id::text IN (SELECT entity_id FROM audit_events WHERE action = 'ncr.opened-for-earlier-decision')
            AND NOT EXISTS (SELECT 1 FROM ncr_dispositions d WHERE d.nonconformance_id = n.id)
            AND NOT EXISTS (SELECT 1 FROM vendor_returns v WHERE v.nonconformance_id = n.id);
       DELETE FROM nonconformance_pieces WHERE nonconformance_id IN (SELECT id FROM earlier_ncrs);
       DELETE FROM nonconformance_defects WHERE nonconformance_id IN (SELECT id FROM earlier_ncrs);
       DELETE FROM nonconformances WHERE id IN (SELECT id FROM earlier_ncrs);
       DELETE FROM defect_codes WHERE code = 'depolarisation' AND NOT EXISTS (SELECT 1 FROM nonconformance_defects WHERE defect_code_id = defect_codes.id);`,
      { transaction },
    );
  });
