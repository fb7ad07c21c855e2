// The inspection queue as one paged list: every lot waiting for inspection with its plan, sample and
// where the sample stands, read in one query. Per lot the query gathers only the verdicts of each
// sample piece's current results (and, while a 100 % sort runs, how many pieces share each set of
// verdicts); the proposal and the counts come from the same shared rules the lot page uses.
import { pieceVerdict, proposeLotVerdict, type PieceVerdict } from '../../shared/inspection/lotVerdict';
import type { QueueRow } from '../../shared/schemas/inspection';
import type { ListQuery } from '../../shared/schemas/paging';
import { lotName, type LotState } from '../../shared/schemas/stock';
import type { ListDefinition } from '../http/list';
import { LOTS_AWAITING_INSPECTION } from './lotAccess';

const DAY_MS = 86_400_000;

/** The distinct verdicts of a piece's current results that judge it (none while unmeasured). */
const verdictsOf = (piece: string) =>
  `ARRAY(SELECT DISTINCT r.verdict FROM piece_results r
          WHERE r.piece_id = ${piece} AND r.superseded_by_file_id IS NULL AND (r.result ->> 'judged') IS DISTINCT FROM 'false' ORDER BY 1)`;

type SampleEntry = [serial: string, verdicts: PieceVerdict[]];
type SortGroup = [verdicts: PieceVerdict[], pieces: number];

export const inspectionQueue: ListDefinition<QueueRow, ListQuery> = {
  select: `l.id AS "lotId", l.state, p.id AS "partId", p.number AS "partNumber", p.description AS "partDescription",
    sup.name AS supplier, sup.id AS "supplierId", l.supplier_lot AS "supplierLot", l.quantity, l.received_at AS "receivedAt",
    li.id AS "inspectionId", li.code_letter AS "codeLetter", li.plan_letter AS "planLetter", li.sample_size AS "sampleSize",
    li.accept_number AS accept, li.reject_number AS reject, li.severity`,
  // Where each sample stands, for the lots of the page only: in the SELECT list of the paged query it
  // would also be worked out for every lot the OFFSET skips.
  late: {
    select: `(SELECT json_agg(json_build_array(pc.serial, ${verdictsOf('pc.id')}) ORDER BY pc.serial)
        FROM sample_pieces sp JOIN pieces pc ON pc.id = sp.piece_id WHERE sp.inspection_id = page."inspectionId") AS sample,
      CASE WHEN page.state = 'sorting' THEN
        (SELECT json_agg(json_build_array(g.verdicts, g.pieces)) FROM (
           SELECT ${verdictsOf('pc.id')} AS verdicts, count(*) AS pieces FROM pieces pc WHERE pc.lot_id = page."lotId" AND pc.state <> 'issued' GROUP BY 1) g)
      END AS "sortGroups"`,
    from: '',
  },
  // The receipt time is the lot's copy of its shipment's, so the shipment is not joined: each table
  // joined multiplies the join orders PostgreSQL weighs while planning every page (page 2: 2.9 ms
  // of planning with it, 1.3 ms without). A lot received while acceptance is discontinued has no
  // plan (li) until inspection resumes.
  from: `lots l
    JOIN purchase_order_lines pol ON pol.id = l.po_line_id
    JOIN purchase_orders po ON po.id = pol.purchase_order_id
    JOIN suppliers sup ON sup.id = po.supplier_id
    JOIN parts p ON p.id = l.part_id
    LEFT JOIN lot_inspections li ON li.lot_id = l.id`,
  filters: () => ({ clauses: [LOTS_AWAITING_INSPECTION.where], replacements: {} }),
  // The lot's copy of its shipment's receipt time: the open lots' index keeps it in order.
  sortable: { receivedAt: 'l.received_at', lotId: 'l.id', state: 'l.state', quantity: 'l.quantity', partNumber: 'p.number', supplier: 'sup.name' },
  // Oldest first: the lot waiting longest is inspected next.
  notNull: ['receivedAt', 'lotId'],
  defaultSort: 'receivedAt',
  tieBreaker: 'l.id',
  search: ["'L-' || l.id", 'l.supplier_lot', 'p.number', 'sup.name'],
  present: (r) => {
    const receivedAt = (r.receivedAt as Date).toISOString().slice(0, 10);
    const row = {
      lotId: Number(r.lotId),
      state: r.state as LotState,
      part: { id: Number(r.partId), number: String(r.partNumber), description: String(r.partDescription) },
      supplier: String(r.supplier),
      supplierId: Number(r.supplierId),
      supplierLot: String(r.supplierLot),
      quantity: Number(r.quantity),
      receivedAt,
      daysInQuarantine: Math.floor((Date.now() - new Date(receivedAt).getTime()) / DAY_MS),
    };
    if (r.sampleSize === null) return { ...row, acceptanceDiscontinued: true, plan: null, sampleSerials: [], measured: 0, sortRemaining: null, proposal: null };
    const plan = {
      codeLetter: String(r.codeLetter),
      planLetter: String(r.planLetter),
      sampleSize: Number(r.sampleSize),
      accept: Number(r.accept),
      reject: Number(r.reject),
      severity: String(r.severity),
    };
    const sample = (r.sample as SampleEntry[] | null) ?? [];
    const verdict = proposeLotVerdict(
      sample.map(([serial, verdicts]) => ({ serial, verdicts })),
      plan,
    );
    const sortGroups = r.sortGroups as SortGroup[] | null;
    // A sort needs a verdict of every piece still on site: those without pass or fail remain.
    const sortRemaining =
      row.state === 'sorting'
        ? (sortGroups ?? []).filter(([verdicts]) => !['pass', 'fail'].includes(pieceVerdict(verdicts))).reduce((n, [, pieces]) => n + Number(pieces), 0)
        : null;
    return {
      ...row,
      acceptanceDiscontinued: false,
      plan,
      sampleSerials: sample.map(([serial]) => serial),
      measured: verdict.measured,
      sortRemaining,
      proposal: verdict.proposal,
    };
  },
  csv: {
    filename: 'inspection-queue',
    columns: [
      { header: 'lot', value: (r) => lotName(r.lotId) },
      { header: 'state', value: (r) => r.state },
      { header: 'part_number', value: (r) => r.part.number },
      { header: 'supplier', value: (r) => r.supplier },
      { header: 'supplier_lot', value: (r) => r.supplierLot },
      { header: 'quantity', value: (r) => r.quantity },
      { header: 'received_on', value: (r) => r.receivedAt },
      { header: 'days_waiting', value: (r) => r.daysInQuarantine },
      { header: 'acceptance_discontinued', value: (r) => (r.acceptanceDiscontinued ? 'yes' : 'no') },
      { header: 'severity', value: (r) => r.plan?.severity ?? null },
      { header: 'sample_size', value: (r) => r.plan?.sampleSize ?? null },
      { header: 'accept', value: (r) => r.plan?.accept ?? null },
      { header: 'reject', value: (r) => r.plan?.reject ?? null },
      { header: 'measured', value: (r) => r.measured },
      { header: 'sort_remaining', value: (r) => r.sortRemaining },
      { header: 'proposal', value: (r) => r.proposal },
    ],
  },
};
