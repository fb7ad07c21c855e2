import type { PieceHistoryView } from '../../../shared/schemas/receiving';
import type { PieceHistoryRecord } from '../../receiving/pieces';
import { presentLotAuditEvents } from '../lots/presenter';

export function presentPieceHistory({ piece: p, moves, auditEvents, asIs, readings, documents }: PieceHistoryRecord): PieceHistoryView {
  return {
    id: p.id,
    serial: p.serial,
    state: p.state,
    location: p.locationCode ? { code: p.locationCode, kind: p.locationKind! } : null,
    part: { id: p.partId, number: p.partNumber, description: p.partDescription },
    supplier: { id: p.supplierId, name: p.supplierName },
    purchaseOrder: { id: p.purchaseOrderId, number: p.poNumber, lineNumber: p.lineNumber },
    lot: { id: p.lotId, supplierLot: p.supplierLot, state: p.lotState },
    moves: moves.map((m) => ({ ...m, id: Number(m.id), at: m.at.toISOString() })),
    history: presentLotAuditEvents(auditEvents),
    releasedAsIs: asIs
      ? { deviationNumber: asIs.deviation_number, justification: asIs.justification, signedBy: asIs.signer, signedAt: asIs.signed_at.toISOString() }
      : null,
    readings: readings.map((r) => ({
      wavelengthNm: Number(r.wavelength_nm),
      verdict: r.verdict,
      retardanceWaves: r.result.retardanceWaves,
      retardanceErrorWaves: r.result.retardanceErrorWaves,
      axisErrorDeg: r.result.axisErrorDeg,
      reasons: r.result.reasons,
      file: r.file,
      instrument: r.instrument,
      measuredAt: r.measured_at.toISOString(),
      current: !r.superseded,
    })),
    documents: documents.map((d) => ({ number: d.number, kind: d.kind, issuedAt: d.issued_at.toISOString(), revokedAt: d.revoked_at?.toISOString() ?? null })),
  };
}
