import { switchingPhaseOf } from '../../../shared/sampling';
import type { SwitchingHistoryEntry, SwitchingView } from '../../../shared/schemas/switching';
import type { SwitchingPairRecord } from '../../inspection/switchingPairs';

export function presentSwitchingPair({ supplierId, partId, names, state, settings, waiting, open, events }: SwitchingPairRecord): SwitchingView {
  return {
    supplier: { id: supplierId, name: names.supplier },
    part: { id: partId, number: names.part, description: names.description },
    phase: switchingPhaseOf(state),
    state,
    reducedEnabled: settings.reducedInspectionEnabled,
    waitingLots: waiting.map((l) => ({ id: l.id, supplierLot: l.supplierLot, quantity: l.quantity, receivedAt: l.receivedAt.toISOString() })),
    openLots: open.map((l) => ({ id: l.id, supplierLot: l.supplier_lot, state: l.state, severity: l.severity })),
    history: events.map((e) => ({
      id: e.id,
      kind: e.kind,
      position: e.position,
      lotId: e.lot_id,
      decision: e.decision,
      accepted: e.result?.accepted ?? null,
      defectives: e.result?.defectives ?? null,
      sampledOn: (e.result?.plan.severity as SwitchingHistoryEntry['sampledOn']) ?? null,
      severity: e.severity,
      reason: e.reason,
      reference: e.reference,
      correctiveActionId: e.corrective_action_id,
      by: e.by,
      from: switchingPhaseOf(e.before),
      to: switchingPhaseOf(e.after),
      explanation: e.explanation,
      at: e.created_at.toISOString(),
      superseded: e.superseded_at !== null,
    })),
  };
}
