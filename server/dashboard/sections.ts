// The dashboard's sections: one read each (one statement, or the audit chain's own check), cut to a
// few rows with the full count beside them. Each names the role permission that shows it and what it
// reads, so a section reaches only users who may read everything in it.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import type { Permission } from '../../shared/policies';
import type { Bar, DashboardLotRow, DashboardView } from '../../shared/schemas/dashboard';
import type { InstrumentView } from '../../shared/schemas/instruments';
import type { LotState } from '../../shared/schemas/stock';
import { checkChainTail } from '../audit/verify';
import { calibrationsDue } from '../instruments/calibrations';
import { receivedAsOrderedSql } from '../stock/standing';

type Reader = { id: number };
type Section<Name extends keyof DashboardView> = {
  permission: Permission;
  reads: Permission[];
  read: (user: Reader) => Promise<NonNullable<DashboardView[Name]>>;
};

const ROWS = 6;
const DUE_WITHIN_DAYS = 14;
const CALIBRATION_WITHIN_DAYS = 30;
const REJECTIONS_OVER_DAYS = 90;

/** A statement of subqueries and aggregates: it always answers one row. */
async function one<T extends object>(sql: string): Promise<T> {
  const [row] = await sequelize.query<T>(sql, { type: QueryTypes.SELECT });
  if (!row) throw new Error('The dashboard read answered no row');
  return row;
}

const day = (value: string | Date) => (typeof value === 'string' ? value.slice(0, 10) : value.toISOString().slice(0, 10));

/** Counts by age, oldest bucket last: `age` is an SQL expression in whole days. */
const AGE_BUCKETS = [
  { label: '0–2 days', upTo: 2 },
  { label: '3–6 days', upTo: 6 },
  { label: '7–13 days', upTo: 13 },
  { label: '14–29 days', upTo: 29 },
  { label: '30 days or more', upTo: null },
];
const ageCountsSql = (age: string) =>
  `json_build_array(${AGE_BUCKETS.map((bucket, i) => {
    const from = i === 0 ? null : AGE_BUCKETS[i - 1].upTo! + 1;
    const conditions = [from === null ? null : `${age} >= ${from}`, bucket.upTo === null ? null : `${age} <= ${bucket.upTo}`].filter(Boolean).join(' AND ');
    return `count(*) FILTER (WHERE ${conditions})`;
  }).join(', ')})`;
const ageBars = (counts: (number | string)[]): Bar[] => AGE_BUCKETS.map((bucket, i) => ({ label: bucket.label, value: Number(counts[i]) }));

/** Lots in `states`, oldest arrival first, as dashboard rows; uses the open lots' index by arrival. */
const lotRowsSql = (states: string) => `
  SELECT coalesce(json_agg(r ORDER BY r.received_at, r.id), '[]') FROM (
    SELECT l.id, l.state, l.quantity, l.received_at, current_date - l.received_at::date AS days, p.number AS part_number, s.name AS supplier
      FROM lots l JOIN parts p ON p.id = l.part_id JOIN purchase_order_lines pl ON pl.id = l.po_line_id
      JOIN purchase_orders po ON po.id = pl.purchase_order_id JOIN suppliers s ON s.id = po.supplier_id
     WHERE l.state IN (${states}) ORDER BY l.received_at, l.id LIMIT ${ROWS}) r`;
type LotRowRecord = { id: number; state: LotState; quantity: number; received_at: string; days: number; part_number: string; supplier: string };
const lotRow = (r: LotRowRecord): DashboardLotRow => ({
  lotId: r.id,
  state: r.state,
  partNumber: r.part_number,
  supplier: r.supplier,
  quantity: r.quantity,
  receivedOn: day(r.received_at),
  days: r.days,
});

const TO_MEASURE = `'quarantine', 'inspection', 'sorting'`;

export const receiving: Section<'receiving'> = {
  permission: 'dashboard.receiving',
  reads: ['catalog.read', 'lots.read'],
  async read() {
    // Open POs only (a partial index): the lines still owed pieces, each counted once.
    const row = await one<{
      due_total: string;
      late: string;
      due: { po_id: number; number: string; line: number; part_number: string; supplier: string; due_on: string; outstanding: number; days_late: number }[];
      lines: string;
      pieces: string;
      by_supplier: { id: number; name: string; pieces: number }[];
    }>(
      `WITH owed AS (
         SELECT * FROM (
           SELECT pl.id, pl.line_number, pl.due_on, po.id AS po_id, po.number, po.supplier_id, p.number AS part_number,
                  pl.quantity - ${receivedAsOrderedSql('ol.po_line_id = pl.id')} AS outstanding
             FROM purchase_orders po JOIN purchase_order_lines pl ON pl.purchase_order_id = po.id JOIN parts p ON p.id = pl.part_id
            WHERE po.status = 'open') lines
          WHERE outstanding > 0)
       SELECT (SELECT count(*) FROM owed WHERE due_on <= current_date + ${DUE_WITHIN_DAYS}) AS due_total,
              (SELECT count(*) FROM owed WHERE due_on < current_date) AS late,
              (SELECT coalesce(json_agg(d ORDER BY d.due_on, d.id), '[]') FROM (
                 SELECT o.id, o.po_id, o.number, o.line_number AS line, o.part_number, s.name AS supplier, o.due_on, o.outstanding,
                        current_date - o.due_on AS days_late
                   FROM owed o JOIN suppliers s ON s.id = o.supplier_id
                  WHERE o.due_on <= current_date + ${DUE_WITHIN_DAYS} ORDER BY o.due_on, o.id LIMIT ${ROWS}) d) AS due,
              (SELECT count(*) FROM owed) AS lines,
              (SELECT coalesce(sum(outstanding), 0) FROM owed) AS pieces,
              (SELECT coalesce(json_agg(b ORDER BY b.pieces DESC, b.name), '[]') FROM (
                 SELECT s.id, s.name, sum(o.outstanding) AS pieces FROM owed o JOIN suppliers s ON s.id = o.supplier_id
                  GROUP BY s.id, s.name ORDER BY pieces DESC, s.name LIMIT ${ROWS}) b) AS by_supplier`,
    );
    return {
      due: {
        total: Number(row.due_total),
        late: Number(row.late),
        rows: row.due.map((d) => ({
          purchaseOrderId: d.po_id,
          purchaseOrder: d.number,
          line: d.line,
          partNumber: d.part_number,
          supplier: d.supplier,
          dueOn: day(d.due_on),
          outstanding: Number(d.outstanding),
          daysLate: d.days_late,
        })),
      },
      awaited: {
        lines: Number(row.lines),
        pieces: Number(row.pieces),
        bySupplier: row.by_supplier.map((b) => ({ label: b.name, value: Number(b.pieces), link: `/purchasing/orders?q=${encodeURIComponent(b.name)}` })),
      },
    };
  },
};

export const inspection: Section<'inspection'> = {
  permission: 'dashboard.inspection',
  reads: ['lots.read'],
  async read() {
    const row = await one<{ total: string; rows: LotRowRecord[]; ages: string[] }>(
      `SELECT count(*) AS total, ${ageCountsSql('current_date - received_at::date')} AS ages, (${lotRowsSql(TO_MEASURE)}) AS rows
         FROM lots WHERE state IN (${TO_MEASURE})`,
    );
    return { toMeasure: { total: Number(row.total), rows: row.rows.map(lotRow) }, ages: ageBars(row.ages) };
  },
};

export const quality: Section<'quality'> = {
  permission: 'dashboard.quality',
  reads: ['lots.read', 'nonconformance.read', 'instruments.read'],
  async read() {
    // Calibrations as the instruments area reads them (each instrument's newest record): a handful of rows.
    const [calibrations, row] = await Promise.all([
      calibrationsDue(CALIBRATION_WITHIN_DAYS),
      one<{
        awaiting_total: string;
        awaiting: LotRowRecord[];
        ncr_total: string;
        ncr_ages: string[];
        ncrs: { id: number; number: string; status: 'open' | 'dispositioned'; supplier: string; part_number: string; opened_at: string; days: number }[];
      }>(
        `SELECT (SELECT count(*) FROM lots WHERE state = 'awaiting-disposition') AS awaiting_total,
              (${lotRowsSql(`'awaiting-disposition'`)}) AS awaiting,
              n.total AS ncr_total, n.ages AS ncr_ages,
              (SELECT coalesce(json_agg(r ORDER BY r.opened_at, r.id), '[]') FROM (
                 SELECT n.id, n.number, n.status, s.name AS supplier, p.number AS part_number, n.opened_at, current_date - n.opened_at::date AS days
                   FROM nonconformances n JOIN suppliers s ON s.id = n.supplier_id JOIN parts p ON p.id = n.part_id
                  WHERE n.status <> 'closed' ORDER BY n.opened_at, n.id LIMIT ${ROWS}) r) AS ncrs
         FROM (SELECT count(*) AS total, ${ageCountsSql('current_date - opened_at::date')} AS ages FROM nonconformances WHERE status <> 'closed') n`,
      ),
    ]);
    return {
      awaitingSignature: { total: Number(row.awaiting_total), rows: row.awaiting.map(lotRow) },
      openNcrs: {
        total: Number(row.ncr_total),
        rows: row.ncrs.map((n) => ({
          id: n.id,
          number: n.number,
          status: n.status,
          supplier: n.supplier,
          partNumber: n.part_number,
          openedOn: day(n.opened_at),
          days: n.days,
        })),
      },
      ncrAges: ageBars(row.ncr_ages),
      calibrations: {
        total: calibrations.length,
        lapsed: calibrations.filter((c) => c.daysLeft < 0).length,
        rows: calibrations
          .slice(0, ROWS)
          .map((c) => ({ instrumentId: c.instrumentId, code: c.code, kind: c.kind as InstrumentView['kind'], dueOn: c.dueOn, daysLeft: c.daysLeft })),
      },
    };
  },
};

export const purchasing: Section<'purchasing'> = {
  permission: 'dashboard.purchasing',
  reads: ['lots.read', 'corrective.read'],
  async read(user) {
    const row = await one<{
      rejected_total: string;
      rejected: {
        lot_id: number;
        decision: 'reject' | 'sort';
        part_number: string;
        supplier: string;
        po_number: string;
        signed_at: string;
        buyer_id: number | null;
      }[];
      by_supplier: { id: number; name: string; lots: number }[];
      ca_total: string;
      ca_late: string;
      cas: {
        id: number;
        number: string;
        status: 'awaiting-response' | 'responded' | 'accepted';
        supplier: string;
        part_number: string;
        response_due_on: string;
        days: number;
      }[];
    }>(
      `WITH rejections AS (
         SELECT d.id, d.lot_id, d.decision, d.signed_at, p.number AS part_number, s.id AS supplier_id, s.name AS supplier, po.number AS po_number, po.buyer_id
           FROM dispositions d JOIN lots l ON l.id = d.lot_id JOIN parts p ON p.id = l.part_id
           JOIN purchase_order_lines pl ON pl.id = l.po_line_id JOIN purchase_orders po ON po.id = pl.purchase_order_id JOIN suppliers s ON s.id = po.supplier_id
          WHERE d.superseded_at IS NULL AND d.decision IN ('reject', 'sort') AND d.signed_at >= now() - interval '${REJECTIONS_OVER_DAYS} days')
       SELECT (SELECT count(*) FROM rejections) AS rejected_total,
              (SELECT coalesce(json_agg(r ORDER BY r.signed_at DESC, r.id DESC), '[]') FROM (SELECT * FROM rejections ORDER BY signed_at DESC, id DESC LIMIT ${ROWS}) r) AS rejected,
              (SELECT coalesce(json_agg(b ORDER BY b.lots DESC, b.name), '[]') FROM (
                 SELECT supplier_id AS id, supplier AS name, count(*) AS lots FROM rejections GROUP BY supplier_id, supplier ORDER BY lots DESC, supplier LIMIT ${ROWS}) b) AS by_supplier,
              (SELECT count(*) FROM corrective_actions WHERE status <> 'closed') AS ca_total,
              (SELECT count(*) FROM corrective_actions WHERE status = 'awaiting-response' AND response_due_on < current_date) AS ca_late,
              (SELECT coalesce(json_agg(r ORDER BY r.requested_at, r.id), '[]') FROM (
                 SELECT ca.id, ca.number, ca.status, s.name AS supplier, p.number AS part_number, ca.response_due_on, ca.requested_at,
                        current_date - ca.requested_at::date AS days
                   FROM corrective_actions ca JOIN suppliers s ON s.id = ca.supplier_id JOIN parts p ON p.id = ca.part_id
                  WHERE ca.status <> 'closed' ORDER BY ca.requested_at, ca.id LIMIT ${ROWS}) r) AS cas`,
    );
    const today = new Date().toISOString().slice(0, 10);
    return {
      rejected: {
        total: Number(row.rejected_total),
        rows: row.rejected.map((r) => ({
          lotId: r.lot_id,
          decision: r.decision,
          partNumber: r.part_number,
          supplier: r.supplier,
          purchaseOrder: r.po_number,
          signedOn: day(r.signed_at),
          yours: r.buyer_id === user.id,
        })),
      },
      rejectedBySupplier: row.by_supplier.map((b) => ({ label: b.name, value: Number(b.lots), link: `/supplier-performance/${b.id}` })),
      openCorrective: {
        total: Number(row.ca_total),
        late: Number(row.ca_late),
        rows: row.cas.map((c) => ({
          id: c.id,
          number: c.number,
          status: c.status,
          supplier: c.supplier,
          partNumber: c.part_number,
          responseDueOn: day(c.response_due_on),
          days: c.days,
          late: c.status === 'awaiting-response' && day(c.response_due_on) < today,
        })),
      },
    };
  },
};

const TAIL_CHECKED = 500;
const DOCUMENT_DAYS = 14;

export const audit: Section<'audit'> = {
  permission: 'dashboard.audit',
  reads: ['certificates.read', 'audit.read'],
  async read() {
    const [row, chain] = await Promise.all([
      one<{
        total: string;
        documents: { id: number; number: string; kind: 'certificate' | 'inspection-report'; lot_id: number; issued_at: string; revoked_at: string | null }[];
        per_day: { day: string; documents: number }[];
      }>(
        `SELECT (SELECT count(*) FROM lot_documents WHERE issued_at >= now() - interval '30 days') AS total,
                (SELECT coalesce(json_agg(r ORDER BY r.issued_at DESC, r.id DESC), '[]') FROM (
                   SELECT id, number, kind, lot_id, issued_at, revoked_at FROM lot_documents ORDER BY issued_at DESC, id DESC LIMIT ${ROWS}) r) AS documents,
                (SELECT json_agg(json_build_object('day', d.day, 'documents', coalesce(c.documents, 0)) ORDER BY d.day) FROM
                   generate_series(current_date - ${DOCUMENT_DAYS - 1}, current_date, interval '1 day') AS d(day)
                   LEFT JOIN (SELECT issued_at::date AS day, count(*) AS documents FROM lot_documents
                               WHERE issued_at >= current_date - ${DOCUMENT_DAYS - 1} GROUP BY 1) c ON c.day = d.day::date) AS per_day`,
      ),
      checkChainTail(TAIL_CHECKED),
    ]);
    return {
      documents: {
        total: Number(row.total),
        rows: row.documents.map((d) => ({
          id: d.id,
          number: d.number,
          kind: d.kind,
          lotId: d.lot_id,
          issuedAt: new Date(d.issued_at).toISOString(),
          revoked: d.revoked_at !== null,
        })),
      },
      perDay: row.per_day.map((d) => ({ label: day(d.day), value: Number(d.documents) })),
      chain: { length: chain.head.seq, lastEntryAt: chain.head.occurredAt, tailChecked: chain.checked, tailIntact: chain.intact },
    };
  },
};
