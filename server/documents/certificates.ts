import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { LotDocument } from '../../db/models';
import { notFound } from '../http/errors';
import { sortOf } from '../http/list';
import { DISPOSITION_LABELS, type Disposition } from '../../shared/inspection/lotVerdict';
import type { CertificateListQuery, VerificationResult } from '../../shared/schemas/certificates';
import type { ExportSpanView } from '../../shared/schemas/exports';

type DocumentRow = {
  id: number;
  number: string;
  kind: 'certificate' | 'inspection-report';
  data_hash: string;
  pdf_sha256: string;
  storage_key: string;
  issued_at: Date;
  revoked_at: Date | null;
  lot_id: number;
  supplier_lot: string;
  part_id: number;
  part_number: string;
  part_description: string;
  supplier_id: number;
  supplier_name: string;
  decision: Disposition;
  signer_name: string;
};

const DOCUMENT_SELECT = `
  SELECT d.id, d.number, d.kind, d.data_hash, d.pdf_sha256, d.storage_key, d.issued_at, d.revoked_at,
         l.id AS lot_id, l.supplier_lot, p.id AS part_id, p.number AS part_number, p.description AS part_description,
         sup.id AS supplier_id, sup.name AS supplier_name, disp.decision, u.name AS signer_name
  FROM lot_documents d
  JOIN dispositions disp ON disp.id = d.disposition_id
  JOIN users u ON u.id = disp.signer_id
  JOIN lots l ON l.id = d.lot_id
  JOIN parts p ON p.id = l.part_id
  JOIN purchase_order_lines pol ON pol.id = l.po_line_id
  JOIN purchase_orders po ON po.id = pol.purchase_order_id
  JOIN suppliers sup ON sup.id = po.supplier_id`;

const SORTABLE: Record<string, string> = { issuedAt: 'd.issued_at', number: 'd.number', part: 'p.number', supplier: 'sup.name' };

export type DocumentFilter = Omit<CertificateListQuery, 'page' | 'pageSize' | 'sort'>;

function whereOf(filter: DocumentFilter) {
  const clauses: string[] = [];
  const replacements: Record<string, unknown> = {};
  const add = (clause: string, key: string, value: unknown) => {
    if (value === undefined || value === '') return;
    clauses.push(clause);
    replacements[key] = value;
  };
  add('d.kind = :kind', 'kind', filter.kind);
  add('d.issued_at >= :from::date', 'from', filter.from);
  add("d.issued_at < :to::date + interval '1 day'", 'to', filter.to);
  add('sup.id = :supplierId', 'supplierId', filter.supplierId);
  add('p.id = :partId', 'partId', filter.partId);
  add('(d.number ILIKE :q OR l.supplier_lot ILIKE :q OR p.number ILIKE :q OR sup.name ILIKE :q)', 'q', filter.q ? `%${filter.q}%` : undefined);
  return { sql: clauses.length ? `WHERE ${clauses.join(' AND ')}` : '', replacements };
}

const present = (r: DocumentRow) => ({
  id: r.id,
  number: r.number,
  kind: r.kind,
  dataHash: r.data_hash,
  pdfSha256: r.pdf_sha256,
  issuedAt: r.issued_at.toISOString(),
  revokedAt: r.revoked_at?.toISOString() ?? null,
  lot: { id: r.lot_id, supplierLot: r.supplier_lot },
  part: { id: r.part_id, number: r.part_number, description: r.part_description },
  supplier: { id: r.supplier_id, name: r.supplier_name },
  decision: r.decision,
  signer: r.signer_name,
});
export type DocumentView = ReturnType<typeof present>;

export async function listDocuments(query: CertificateListQuery) {
  const { sql, replacements } = whereOf(query);
  const { expression, direction } = sortOf(SORTABLE, query.sort || '-issuedAt');
  const order = `${expression} ${direction}, d.id DESC`;
  const [{ total }] = await sequelize.query<{ total: string }>(`SELECT count(*) AS total FROM (${DOCUMENT_SELECT} ${sql}) matching`, {
    type: QueryTypes.SELECT,
    replacements,
  });
  const rows = await sequelize.query<DocumentRow>(`${DOCUMENT_SELECT} ${sql} ORDER BY ${order} LIMIT :limit OFFSET :offset`, {
    type: QueryTypes.SELECT,
    replacements: { ...replacements, limit: query.pageSize, offset: (query.page - 1) * query.pageSize },
  });
  return { data: rows.map(present), total: Number(total) };
}

/** Every document matching the filter, oldest first, with what an export needs to fetch its PDF. */
export async function documentsForExport(filter: DocumentFilter) {
  const { sql, replacements } = whereOf(filter);
  const rows = await sequelize.query<DocumentRow>(`${DOCUMENT_SELECT} ${sql} ORDER BY d.issued_at, d.id`, { type: QueryTypes.SELECT, replacements });
  return rows.map((r) => ({ ...present(r), storageKey: r.storage_key }));
}

/** How many documents a filter finds and the first and last day they were issued on (the session's UTC days). */
export async function documentSpan(filter: DocumentFilter): Promise<ExportSpanView> {
  const { sql, replacements } = whereOf(filter);
  const [row] = await sequelize.query<{ documents: string; first: string | null; last: string | null }>(
    `SELECT count(*) AS documents, to_char(min(issued_at), 'YYYY-MM-DD') AS first, to_char(max(issued_at), 'YYYY-MM-DD') AS last
     FROM (${DOCUMENT_SELECT} ${sql}) matching`,
    { type: QueryTypes.SELECT, replacements },
  );
  return { documents: Number(row.documents), first: row.first, last: row.last };
}

export async function verifyDocument(number: string, hash: string): Promise<VerificationResult> {
  const [row] = await sequelize.query<DocumentRow>(`${DOCUMENT_SELECT} WHERE d.number = :number`, { type: QueryTypes.SELECT, replacements: { number } });
  if (!row || row.data_hash !== hash) {
    return { genuine: false, message: 'No document with this number and hash was issued by this site. Treat the document as not genuine.' };
  }
  const current = row.revoked_at === null;
  return {
    genuine: true,
    current,
    message: current
      ? 'Genuine and current: this document was issued by this site and its decision stands.'
      : 'Genuine but revoked: the lot decision it records was superseded; ask the site for the current document.',
    document: {
      number: row.number,
      kind: row.kind,
      issuedAt: row.issued_at.toISOString(),
      revokedAt: row.revoked_at?.toISOString() ?? null,
      part: `${row.part_number} — ${row.part_description}`,
      supplier: row.supplier_name,
      supplierLot: row.supplier_lot,
      decision: DISPOSITION_LABELS[row.decision],
    },
  };
}

/** An issued document by its number, for its stored PDF. */
export async function findDocument(number: string) {
  const document = await LotDocument.findOne({ where: { number } });
  if (!document) throw notFound('Document');
  return document;
}
