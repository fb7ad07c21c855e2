// The bench files measured with one instrument, newest first, each linked to its lot.
import type { InstrumentFileView } from '../../shared/schemas/instruments';
import type { ListQuery } from '../../shared/schemas/paging';
import { lotName } from '../../shared/schemas/stock';
import type { ListDefinition } from '../http/list';

export type InstrumentFilesQuery = ListQuery & { instrumentId: number };

export const instrumentFileList: ListDefinition<InstrumentFileView, InstrumentFilesQuery> = {
  select: `mf.id, mf.original_name AS name, mf.lot_id AS "lotId", mf.method, mf.metadata->>'date' AS "measuredOn", mf.row_count AS "rowCount",
    mf.uploaded_at AS "uploadedAt", coalesce(nullif(u.name, ''), u.email) AS "uploadedBy"`,
  from: `measurement_files mf JOIN users u ON u.id = mf.uploaded_by`,
  sortable: { uploadedAt: 'mf.uploaded_at', name: 'mf.original_name', lot: 'mf.lot_id' },
  notNull: ['uploadedAt', 'name', 'lot'],
  defaultSort: '-uploadedAt',
  tieBreaker: 'mf.id',
  search: ['mf.original_name', `'L-' || mf.lot_id`],
  filters: (query) => ({ clauses: ['mf.instrument_id = :instrumentId'], replacements: { instrumentId: query.instrumentId } }),
  present: (r) => ({
    id: Number(r.id),
    name: String(r.name),
    lotId: Number(r.lotId),
    lot: lotName(Number(r.lotId)),
    method: String(r.method),
    measuredOn: (r.measuredOn as string | null) ?? null,
    rowCount: Number(r.rowCount),
    uploadedAt: (r.uploadedAt as Date).toISOString(),
    uploadedBy: String(r.uploadedBy),
  }),
  csv: {
    filename: 'instrument-files',
    columns: [
      { header: 'file', value: (r) => r.name },
      { header: 'lot', value: (r) => r.lot },
      { header: 'method', value: (r) => r.method },
      { header: 'measured_on', value: (r) => r.measuredOn },
      { header: 'rows', value: (r) => r.rowCount },
      { header: 'uploaded_at', value: (r) => r.uploadedAt },
      { header: 'uploaded_by', value: (r) => r.uploadedBy },
    ],
  },
};
