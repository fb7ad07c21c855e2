// A serial's whole story: where the piece came from, its moves, its lot's events, its readings and the
// documents issued for its lot.

import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { LocationKind, LotState, MoveReason, PieceState } from '../../shared/schemas/stock';
import { notFound } from '../http/errors';
import { failingNowSql } from '../stock/standing';
import { lotAuditEvents } from './lots';

type PieceRow = {
  id: number;
  serial: string;
  state: PieceState;
  locationCode: string | null;
  locationKind: LocationKind | null;
  partId: number;
  partNumber: string;
  partDescription: string;
  supplierId: number;
  supplierName: string;
  purchaseOrderId: number;
  poNumber: string;
  lineNumber: number;
  lotId: number;
  supplierLot: string;
  lotState: LotState;
};
type ReadingRow = {
  wavelength_nm: string;
  verdict: 'pass' | 'fail' | 'incomplete';
  result: { retardanceWaves: number | null; retardanceErrorWaves: number | null; axisErrorDeg: number | null; reasons: string[] };
  file: string;
  instrument: string;
  measured_at: Date;
  superseded: boolean;
};
type DocumentRow = { number: string; kind: 'certificate' | 'inspection-report'; issued_at: Date; revoked_at: Date | null };
type AsIsRow = { deviation_number: string; justification: string | null; signed_at: Date; signer: string | null };

async function inspectionOf(pieceId: number, lotId: number) {
  const readings = await sequelize.query<ReadingRow>(
    `SELECT r.wavelength_nm, r.verdict, r.result, f.original_name AS file, i.code AS instrument, f.uploaded_at AS measured_at,
            r.superseded_by_file_id IS NOT NULL AS superseded
       FROM piece_results r JOIN measurement_files f ON f.id = r.file_id JOIN instruments i ON i.id = f.instrument_id
      WHERE r.piece_id = :pieceId ORDER BY r.id`,
    { type: QueryTypes.SELECT, replacements: { pieceId } },
  );
  const documents = await sequelize.query<DocumentRow>('SELECT number, kind, issued_at, revoked_at FROM lot_documents WHERE lot_id = :lotId ORDER BY id', {
    type: QueryTypes.SELECT,
    replacements: { lotId },
  });
  // A failed piece in use is so only under its lot's signed use-as-is decision: its history says which.
  const [asIs] = await sequelize.query<AsIsRow>(
    `SELECT d.deviation_number, d.justification, d.signed_at, u.name AS signer
       FROM dispositions d LEFT JOIN users u ON u.id = d.signer_id
      WHERE d.lot_id = :lotId AND d.decision = 'use-as-is' AND d.superseded_at IS NULL AND ${failingNowSql(':pieceId')}`,
    { type: QueryTypes.SELECT, replacements: { lotId, pieceId } },
  );
  return { asIs, readings, documents };
}

type MoveRow = {
  id: string;
  at: Date;
  reason: MoveReason;
  from: string | null;
  to: string | null;
  workOrder: string | null;
  note: string | null;
  who: string | null;
};

/** Every piece with this serial (a serial is unique per part, so usually one) and its whole story. */
export async function findPieceHistories(serial: string) {
  const pieces = await sequelize.query<PieceRow>(
    `SELECT p.id, p.serial, p.state, loc.code AS "locationCode", loc.kind AS "locationKind",
            pt.id AS "partId", pt.number AS "partNumber", pt.description AS "partDescription",
            s.id AS "supplierId", s.name AS "supplierName", po.id AS "purchaseOrderId", po.number AS "poNumber",
            pol.line_number AS "lineNumber", l.id AS "lotId", l.supplier_lot AS "supplierLot", l.state AS "lotState"
       FROM pieces p
       JOIN lots l ON l.id = p.lot_id
       JOIN parts pt ON pt.id = p.part_id
       JOIN purchase_order_lines pol ON pol.id = l.po_line_id
       JOIN purchase_orders po ON po.id = pol.purchase_order_id
       JOIN suppliers s ON s.id = po.supplier_id
       LEFT JOIN piece_locations pl ON pl.piece_id = p.id
       LEFT JOIN locations loc ON loc.id = pl.location_id
      WHERE p.serial = :serial ORDER BY pt.number`,
    { type: QueryTypes.SELECT, replacements: { serial } },
  );
  if (pieces.length === 0) throw notFound(`Serial ${serial}`);
  return Promise.all(
    pieces.map(async (p) => {
      const moves = await sequelize.query<MoveRow>(
        `SELECT m.id, m.moved_at AS at, m.reason, f.code AS "from", t.code AS "to", m.work_order AS "workOrder", m.note, u.name AS who
           FROM stock_moves m LEFT JOIN locations f ON f.id = m.from_location_id LEFT JOIN locations t ON t.id = m.to_location_id
           LEFT JOIN users u ON u.id = m.actor_id
          WHERE m.piece_id = :id ORDER BY m.id`,
        { type: QueryTypes.SELECT, replacements: { id: p.id } },
      );
      return { piece: p, moves, auditEvents: await lotAuditEvents([p.lotId]), ...(await inspectionOf(p.id, p.lotId)) };
    }),
  );
}
export type PieceHistoryRecord = Awaited<ReturnType<typeof findPieceHistories>>[number];
