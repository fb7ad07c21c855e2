import type { PartView } from '../../../shared/schemas/purchasing';
import type { PartRecord } from '../../purchasing/parts';

export const presentPart = ({ part, onHand }: PartRecord): PartView => ({
  id: part.id,
  number: part.number,
  description: part.description,
  spec: part.spec,
  active: part.active,
  onHand,
});
