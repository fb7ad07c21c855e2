// The history of the site that `npm run bench -- fill` writes, decided lot by lot in JavaScript with
// the product's own rules, before SQL multiplies it into pieces, readings and moves: four years of
// receipts from 40 suppliers of 60 parts (120 supplier-part pairs), each lot sampled by ISO 2859-1
// at the severity its pair's switching state gives at receipt, its sample drawn from its seed as the
// server draws it, decided, and fed back into the pair's switching sequence. Everything comes from a
// fixed seed, so two fills are the same. Names are invented and say they are fill data.
import { seededUniform, stokesBenchFile } from '../../db/seeders/benchFiles';
import { analyzeText } from '../../shared/optics';
import { applySwitchingEntry, drawSample, initialSwitchingState, planFor, switchingPhaseOf, type SwitchingState } from '../../shared/sampling';
import type { PartSpec } from '../../shared/schemas/spec';
import type { Disposition } from '../../shared/inspection/lotVerdict';
import { pieceSpecFor } from '../../server/inspection/spec';

export const SCALE = {
  lots: 100_000,
  suppliers: 40,
  parts: 60,
  /** Lots still open at the end of the history: a third each in quarantine, under inspection, awaiting disposition. */
  openLots: 1_200,
  first: Date.UTC(2022, 9, 3),
  last: Date.UTC(2026, 8, 30),
} as const;

const LOTS_PER_LINE = 2;
const LINES_PER_ORDER = 2;
const LOTS_PER_ORDER = LOTS_PER_LINE * LINES_PER_ORDER;
export const ORDERS = SCALE.lots / LOTS_PER_ORDER;
const PAIRS = 120;
const AQLS = [4, 2.5, 4, 2.5] as const;
const DAY = 86_400_000;

export type LotState = 'quarantine' | 'inspection' | 'awaiting-disposition' | 'accepted' | 'rejected' | 'sorted';

export type FillLot = {
  n: number;
  order: number;
  /** 0-based index of the PO line over the whole fill, and its number on its order (1 or 2). */
  line: number;
  lineNumber: number;
  supplier: number;
  part: number;
  quantity: number;
  /** Offset of the lot's first piece among all filled pieces. */
  firstPiece: number;
  receivedAt: Date;
  state: LotState;
  aql: number;
  severity: string;
  codeLetter: string;
  planLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
  hundredPercent: boolean;
  seed: string;
  /** Piece indexes (0-based within the lot) in the order the sample draws them. */
  sample: number[];
  /** How many of the sample are measured, and how many of those fail (the first ones). */
  measured: number;
  defectives: number;
  decision: Exclude<Disposition, 'use-as-is'> | null;
  signedAt: Date | null;
  /** Position and states of the lot's event in its pair's switching sequence. */
  switching: { position: number; before: SwitchingState; after: SwitchingState; explanation: string; changed: boolean } | null;
};

/** Serial of piece `i` of lot `n`: unique within the part, sorted as the pieces are numbered. */
export const serialOf = (n: number, i: number) => `F${String(n + 1).padStart(6, '0')}-${String(i + 1).padStart(2, '0')}`;

/** Supplier and part of a pair; each supplier offers three parts, each part comes from two suppliers. */
const pairOf = (order: number, lineIndexOnOrder: number) => {
  const supplier = order % SCALE.suppliers;
  const pair = supplier + SCALE.suppliers * ((order + lineIndexOnOrder) % 3);
  return { pair, supplier, part: pair % SCALE.parts };
};

export const aqlOfPart = (part: number) => AQLS[part % AQLS.length];

export function simulateHistory(): { lots: FillLot[]; states: Map<string, SwitchingState> } {
  const uniform = seededUniform(20261202);
  const hex = () =>
    Math.floor(uniform() * 2 ** 32)
      .toString(16)
      .padStart(8, '0');
  const pairStates = new Map<number, { state: SwitchingState; position: number; supplier: number; part: number }>();
  // Some suppliers are better than others: a pair's share of lots not accepted lies between 2 % and 8 %.
  const rejectRate = Array.from({ length: PAIRS }, () => 0.02 + 0.06 * uniform());
  const step = (SCALE.last - SCALE.first) / SCALE.lots;
  const lots: FillLot[] = [];
  let firstPiece = 0;
  for (let n = 0; n < SCALE.lots; n++) {
    const order = Math.floor(n / LOTS_PER_ORDER);
    const line = Math.floor(n / LOTS_PER_LINE);
    const lineIndexOnOrder = line % LINES_PER_ORDER;
    const { pair, supplier, part } = pairOf(order, lineIndexOnOrder);
    const quantity = 5 + ((n * 7 + 3) % 11);
    const receivedAt = new Date(SCALE.first + n * step + uniform() * step * 0.5);
    const fromEnd = SCALE.lots - n;
    const open = fromEnd <= SCALE.openLots;
    const openState: LotState = fromEnd <= SCALE.openLots / 3 ? 'quarantine' : fromEnd <= (2 * SCALE.openLots) / 3 ? 'inspection' : 'awaiting-disposition';

    const entry = pairStates.get(pair) ?? { state: initialSwitchingState(), position: 0, supplier, part };
    pairStates.set(pair, entry);
    const aql = aqlOfPart(part);
    const table = planFor({ lotSize: quantity, level: 'II', aql, severity: entry.state.severity });
    const sampleSize = table.hundredPercent ? quantity : table.sampleSize;
    const seed = `${hex()}${hex()}`;
    const serials = Array.from({ length: quantity }, (_, i) => serialOf(n, i));
    const chosen = new Set(table.hundredPercent ? serials : drawSample(serials, sampleSize, seed));
    // The sample in the order the server lists it (by serial), which is the order it is measured in.
    const sample = serials.flatMap((serial, i) => (chosen.has(serial) ? [i] : []));

    const lot: FillLot = {
      n,
      order,
      line,
      lineNumber: lineIndexOnOrder + 1,
      supplier,
      part,
      quantity,
      firstPiece,
      receivedAt,
      aql,
      severity: entry.state.severity,
      codeLetter: table.codeLetter,
      planLetter: table.planLetter,
      sampleSize,
      accept: table.accept,
      reject: table.reject,
      hundredPercent: table.hundredPercent,
      seed,
      sample,
      state: open ? openState : 'accepted',
      measured: 0,
      defectives: 0,
      decision: null,
      signedAt: null,
      switching: null,
    };
    firstPiece += quantity;
    lots.push(lot);
    if (open) {
      lot.measured = lot.state === 'quarantine' ? 0 : lot.state === 'inspection' ? Math.ceil(sampleSize / 2) : sampleSize;
      continue;
    }

    // A pair well into a spell of tightened inspection delivers good lots, so no pair's acceptance is
    // discontinued (which would leave later lots waiting for a resumption this history has none of).
    const notAccepted = entry.state.tightenedCount < 3 && uniform() < rejectRate[pair];
    lot.measured = sampleSize;
    lot.defectives = notAccepted ? Math.min(sampleSize, table.reject) : 0;
    // Lots not accepted are rejected or sorted; none is used as is, which would need deviations of
    // the site's register that this history does not invent.
    lot.decision = !notAccepted ? 'accept' : uniform() < 0.8 ? 'reject' : 'sort';
    lot.state = lot.decision === 'accept' ? 'accepted' : lot.decision === 'reject' ? 'rejected' : 'sorted';
    lot.signedAt = new Date(receivedAt.getTime() + DAY * (1 + 2 * uniform()));

    const before = entry.state;
    const outcome = applySwitchingEntry(before, {
      kind: 'lot',
      result: {
        accepted: lot.decision === 'accept',
        defectives: lot.defectives,
        plan: { planLetter: table.planLetter, sampleSize, accept: table.accept, reject: table.reject, severity: before.severity, aql, level: 'II' },
      },
      settings: { reducedEnabled: true },
    });
    entry.position += 1;
    entry.state = outcome.state;
    lot.switching = {
      position: entry.position,
      before,
      after: outcome.state,
      explanation: outcome.explanation,
      changed: switchingPhaseOf(before) !== switchingPhaseOf(outcome.state),
    };
  }
  const states = new Map([...pairStates.values()].map((e) => [`${e.supplier}/${e.part}`, e.state]));
  return { lots, states };
}

export type ReadingTemplate = { fields: Record<string, string>[]; result: Record<string, unknown> };

/**
 * What a measured piece leaves in the database, from the engine itself: for each specification,
 * `variants` conforming and `variants` nonconforming plates measured on the given instrument, each
 * as its six Stokes readings (the cells by column name, as a commit stores them) and its result.
 * Pieces take them in turn, so the stored values vary as a bench's would.
 */
export function readingTemplates(specs: PartSpec[], instrument: Parameters<typeof pieceSpecFor>[1], variants = 8) {
  return specs.map((spec, s) => {
    const whole = spec.construction === 'multi-order' ? (spec.multiOrder ?? 0) : 0;
    const plates = Array.from({ length: 2 * variants }, (_, i) => ({
      serial: `T-${i}`,
      wavelengthNm: spec.designWavelengthNm,
      // Conforming plates scatter inside the tolerance, nonconforming ones sit 1.6 tolerances out.
      retardanceWaves: whole + spec.nominalWaves + (i < variants ? ((i % 7) - 3) / 10 : 1.6) * spec.retardanceTolWaves,
      fastAxisDeg: (((i % 5) - 2) / 8) * spec.axisTolDeg,
    }));
    const text = stokesBenchFile(plates, { instrument: 'BENCH-2', date: '2026-06-01', operator: 'QC-07', seed: s + 1 });
    const analysed = analyzeText(text, pieceSpecFor(spec, instrument), { keepRows: true });
    if (analysed.fatal || analysed.errors.length) throw new Error(`fill: the engine refused a template file: ${analysed.fatal ?? analysed.errors[0].message}`);
    const template = (serial: string): ReadingTemplate => {
      const piece = analysed.pieces.find((p) => p.serial === serial)!;
      const rows = analysed.rows.filter((r) => r.serial === serial);
      return { fields: rows.map((r) => Object.fromEntries(analysed.columns.map((c, i) => [c, (r.cells[i] ?? '').trim()]))), result: { ...piece } };
    };
    const pass = plates.slice(0, variants).map((p) => template(p.serial));
    const fail = plates.slice(variants).map((p) => template(p.serial));
    if (pass.some((t) => t.result.verdict !== 'pass') || fail.some((t) => t.result.verdict !== 'fail'))
      throw new Error(`fill: template plates of ${spec.designWavelengthNm} nm did not get the intended verdicts`);
    return { pass, fail };
  });
}
