import type { z } from 'zod';
import type { Part } from '../../../db/models';
import type { PartView, partListQuerySchema } from '../../../shared/schemas/purchasing';
import { retardanceName, type PartSpec } from '../../../shared/schemas/spec';
import { filterWhen, type ListDefinition } from '../../http/list';
import { onHandSql } from '../../stock/onHand';

export const presentPart = (part: Part, onHand: number): PartView => ({
  id: part.id,
  number: part.number,
  description: part.description,
  spec: part.spec,
  active: part.active,
  onHand,
});

export const partList: ListDefinition<PartView, z.infer<typeof partListQuerySchema>> = {
  select: `p.id, p.number, p.description, p.spec, p.active, ${onHandSql('p.id')} AS "onHand"`,
  from: 'parts p',
  sortable: {
    number: 'p.number',
    description: 'p.description',
    nominalWaves: "(p.spec->>'nominalWaves')::numeric",
    designWavelengthNm: "(p.spec->>'designWavelengthNm')::numeric",
    material: "p.spec->>'material'",
    construction: "p.spec->>'construction'",
    onHand: '"onHand"',
  },
  defaultSort: 'number',
  tieBreaker: 'p.id',
  search: ['p.number', 'p.description', "p.spec->>'material'", "p.spec->>'construction'"],
  filters: (query) => filterWhen({ clauses: [], replacements: {} }, query.active, 'p.active = :active', 'active'),
  present: (r) => ({
    id: Number(r.id),
    number: String(r.number),
    description: String(r.description),
    spec: r.spec as PartSpec,
    active: Boolean(r.active),
    onHand: Number(r.onHand),
  }),
  csv: {
    filename: 'parts',
    columns: [
      { header: 'part_number', value: (p) => p.number },
      { header: 'description', value: (p) => p.description },
      { header: 'retardance', value: (p) => retardanceName(p.spec) },
      { header: 'nominal_waves', value: (p) => p.spec.nominalWaves },
      { header: 'design_wavelength_nm', value: (p) => p.spec.designWavelengthNm },
      { header: 'retardance_tolerance_waves', value: (p) => p.spec.retardanceTolWaves },
      { header: 'axis_tolerance_deg', value: (p) => p.spec.axisTolDeg },
      { header: 'construction', value: (p) => p.spec.construction },
      { header: 'material', value: (p) => p.spec.material },
      { header: 'diameter_mm', value: (p) => p.spec.diameterMm },
      { header: 'decision_rule', value: (p) => p.spec.decisionRule },
      { header: 'on_hand', value: (p) => p.onHand },
      { header: 'active', value: (p) => p.active },
    ],
  },
};
