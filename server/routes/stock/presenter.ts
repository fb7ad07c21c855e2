import type { LocationView } from '../../../shared/schemas/stock';
import type { LocationRecord } from '../../stock/locations';
import type { StockMoves } from '../../stock/moves';

export const presentLocation = (l: LocationRecord): LocationView => ({ id: l.id, code: l.code, name: l.name, kind: l.kind, active: l.active });

export const presentMoves = (moves: StockMoves) => ({ moved: moves.length, moveIds: moves.map((m) => m.id) });
