import { QueryTypes } from 'sequelize';
import { beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { meterFile, recordHistoryLot, type HistoryLot, type HistoryPeople } from '../../../db/seeders/performanceDemo';
import { checkDrift } from '../../supplierperformance/drift';
import { as } from '../../../tests/helpers/api';
import { freshSupplierPart, historyPeople } from '../../../tests/helpers/supplierHistory';
import { uniqueTag } from '../../../tests/helpers/purchasing';

const PASSING = { retardanceWaves: 0.0004, axisDeg: 0.05 };
// Twice the ±0.003 λ ordered.
const FAILING = { retardanceWaves: 0.006, axisDeg: 0.05 };
const PERIOD = 'from=2026-06-01&to=2026-07-31';

type LotPlan = Pick<HistoryLot, 'dueOn' | 'receivedAt' | 'decision' | 'measure'> & { failing?: number };

/** Lots of 5 plates on their own PO lines: a lot that small is inspected 100 %, every plate read. */
async function lotsOf(people: HistoryPeople, supplierId: number, partId: number, tag: string, plans: LotPlan[]) {
  const ids: number[] = [];
  for (const [i, plan] of plans.entries()) {
    ids.push(
      await recordHistoryLot(people, {
        supplierId,
        partId,
        poNumber: `PO-${tag}-${i + 1}`,
        orderedOn: '2026-05-01',
        quantity: 5,
        serialPrefix: `${tag}-${i + 1}-`,
        supplierLot: `SL-${tag}-${i + 1}`,
        errors: (index) => (index < (plan.failing ?? 0) ? FAILING : PASSING),
        ...plan,
      }),
    );
  }
  return ids;
}

describe('the scorecard of a supplier', () => {
  let people: HistoryPeople;
  let supplier: Awaited<ReturnType<typeof freshSupplierPart>>;

  beforeAll(async () => {
    people = await historyPeople();
    supplier = await freshSupplierPart();
    const { supplierId, partId, tag } = supplier;
    // The history, in the order it happened (each lot decided before the next arrives):
    //   F 05-20, due 05-25, all pass, accepted          (before the period)
    //   A 06-05, due 06-10, all pass, accepted          on time
    //   B 06-12, due 06-10, 2 fail, one read again and passing, rejected   late
    //   C 06-30, due 07-01, 1 fails, sorted 100 %       on time
    //   D 07-02, due 07-01, all pass, rejected, then that decision superseded by an acceptance   late
    //   E 07-10, no due date, all pass, not decided
    //   G 07-20, no due date, 3 of 5 read, passing, not decided
    const [, , lotB] = await lotsOf(people, supplierId, partId, tag, [
      { receivedAt: '2026-05-20T10:00:00Z', dueOn: '2026-05-25' },
      { receivedAt: '2026-06-05T10:00:00Z', dueOn: '2026-06-10' },
      { receivedAt: '2026-06-12T10:00:00Z', dueOn: '2026-06-10', failing: 2, decision: 'none' },
    ]);
    const inspector = await as('inspector');
    const view = await inspector.get(`/api/inspection/lots/${lotB}`).expect(200);
    const failed = view.body.pieces.filter((p: { verdict: string }) => p.verdict === 'fail').map((p: { serial: string }) => p.serial);
    expect(failed).toHaveLength(2);
    await inspector
      .post(`/api/inspection/lots/${lotB}/measurements`)
      .attach('files', await meterFile([{ serial: failed[0], wavelengthNm: 632.8, retardanceWaves: 0.2502, fastAxisDeg: 0.05 }]), {
        filename: 'again.csv',
        contentType: 'text/csv',
      })
      .expect(201);
    await (
      await as('quality')
    )
      .post(`/api/inspection/lots/${lotB}/dispositions`)
      .send({ decision: 'reject', password: people.password, meaningAcknowledged: true, expectedDispositionId: null, justification: 'One plate long.' })
      .expect(201);
    await lotsOf(people, supplierId, partId, `${tag}b`, [
      { receivedAt: '2026-06-30T10:00:00Z', dueOn: '2026-07-01', failing: 1, decision: 'sort' },
      { receivedAt: '2026-07-02T10:00:00Z', dueOn: '2026-07-01', decision: 'reject-then-verdict' },
      { receivedAt: '2026-07-10T10:00:00Z', decision: 'none' },
      { receivedAt: '2026-07-20T10:00:00Z', decision: 'none', measure: 3 },
    ]);
  }, 120_000);

  it('counts lots, pieces and deliveries of the period as worked out by hand', async () => {
    const response = await (await as('buyer')).get(`/api/suppliers/${supplier.supplierId}/scorecard?${PERIOD}`).expect(200);
    const { figures, period, parts } = response.body;
    expect(period).toEqual({ from: '2026-06-01', to: '2026-07-31' });
    // Lots A, B, C, D, E, G arrived in the period; A, B, C, D are decided and A, D accepted (their
    // current decisions; C's sort is not an acceptance): 2 / 4 = 0.5.
    expect(figures).toMatchObject({ lotsReceived: 6, lotsDecided: 4, lotsAccepted: 2, acceptanceRate: 0.5 });
    // Pieces with a verdict: 5 + 5 + 5 + 5 + 5 + 3 = 28; failing now: B's second plate (its first
    // read again and passing) and C's one: 2 / 28 × 10⁶ = 71 428.6 → 71 429.
    expect(figures).toMatchObject({ piecesInspected: 28, piecesNonconforming: 2, ppm: 71429 });
    // Due dates on A, B, C, D; on or before them: A (06-05 ≤ 06-10) and C (06-30 ≤ 07-01): 2 / 4.
    expect(figures).toMatchObject({ lotsWithDueDate: 4, lotsOnTime: 2, onTimeRate: 0.5 });
    expect(parts).toHaveLength(1);
    expect(parts[0].figures).toMatchObject({ lotsReceived: 6, acceptanceRate: 0.5, ppm: 71429, onTimeRate: 0.5 });
    // F accepted, A accepted, B rejected, C not accepted: two lots not accepted among the last five
    // on normal inspection send the part to tightened inspection (ISO 2859-1:1999, 9.3.2); D's
    // acceptance is the first of the five needed to come back.
    expect(parts[0].switching).toEqual({ phase: 'tightened', consecutiveAccepted: 1 });
  });

  it('answers one part, a CSV, and refuses what it cannot answer', async () => {
    const buyer = await as('buyer');
    const one = await buyer.get(`/api/suppliers/${supplier.supplierId}/scorecard?${PERIOD}&partId=${supplier.partId}`).expect(200);
    expect(one.body.part).toMatchObject({ id: supplier.partId });
    expect(one.body.figures.lotsReceived).toBe(6);
    const csv = await buyer.get(`/api/suppliers/${supplier.supplierId}/scorecard?${PERIOD}&format=csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const lines = csv.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\n');
    expect(lines[0]).toContain('lot_acceptance_rate');
    expect(lines).toHaveLength(3);
    expect(lines[2]).toContain('all parts,2026-06-01,2026-07-31,6,4,2,0.5,28,2,71429,4,2,0.5');

    const other = await freshSupplierPart();
    await buyer.get(`/api/suppliers/${supplier.supplierId}/scorecard?partId=${other.partId}`).expect(404);
    await buyer.get('/api/suppliers/2000000000/scorecard').expect(404);
    const backwards = await buyer.get(`/api/suppliers/${supplier.supplierId}/scorecard?from=2026-07-01&to=2026-06-01`).expect(400);
    expect(backwards.body.error.details).toEqual([{ path: 'from', message: 'The first day comes after the last' }]);
    await buyer.get(`/api/suppliers/${supplier.supplierId}/scorecard?from=June`).expect(400);
    await (await as('clerk')).get(`/api/suppliers/${supplier.supplierId}/scorecard`).expect(403);
    await (await as('auditor')).get(`/api/suppliers/${supplier.supplierId}/scorecard`).expect(200);
  });

  it('ranks suppliers by lot acceptance and lists them as CSV', async () => {
    const better = await freshSupplierPart(`${supplier.tag}X`);
    await lotsOf(people, better.supplierId, better.partId, better.tag, [{ receivedAt: '2026-06-20T10:00:00Z', dueOn: '2026-06-25' }]);
    const idle = await freshSupplierPart(`${supplier.tag}Z`);
    const list = await (await as('quality')).get(`/api/supplier-scorecards?${PERIOD}&q=${supplier.tag}`).expect(200);
    const rows = list.body.data as { rank: number | null; supplier: { id: number }; acceptanceRate: number | null; ppm: number | null }[];
    expect(rows.map((r) => r.supplier.id)).toEqual([better.supplierId, supplier.supplierId, idle.supplierId]);
    const [first, second, third] = rows;
    expect(first).toMatchObject({ acceptanceRate: 1, ppm: 0 });
    expect(second).toMatchObject({ acceptanceRate: 0.5, ppm: 71429 });
    expect(first.rank!).toBeLessThan(second.rank!);
    // No lot decided in the period: listed, not ranked.
    expect(third).toMatchObject({ rank: null, acceptanceRate: null });

    const csv = await (await as('auditor')).get(`/api/supplier-scorecards/export.csv?${PERIOD}&q=${supplier.tag}`).expect(200);
    const lines = csv.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\n');
    expect(lines[0]).toBe(
      'rank,supplier,period_from,period_to,lots_received,lots_decided,lot_acceptance_rate,nonconforming_ppm,on_time_rate,open_ncrs,open_corrective_actions,drift_alarms',
    );
    expect(lines).toHaveLength(4);
    await (await as('buyer')).get('/api/supplier-scorecards?sort=secret').expect(400);
  });
});

describe('NCRs and corrective actions on the scorecard', () => {
  it('counts those open now with their age in whole days, and those raised in the period', async () => {
    const { supplierId, partId, tag } = await freshSupplierPart();
    // The part is on a PO of the supplier (so it has a row), with no lot.
    await (
      await as('buyer')
    )
      .post('/api/purchase-orders')
      .send({
        number: `PO-${tag}`,
        supplierId,
        orderedOn: '2026-05-01',
        currency: 'EUR',
        lines: [{ partId, quantity: 5, unitPrice: 1, inspectionLevel: 'II', aql: 1 }],
      })
      .expect(201);
    const [{ id: buyerId }] = await sequelize.query<{ id: number }>(`SELECT id FROM users WHERE email = 'buyer@phaselot.test'`, { type: QueryTypes.SELECT });
    const at = (daysAgo: number, hours = 2) => new Date(Date.now() - daysAgo * 86_400_000 - hours * 3_600_000).toISOString();
    const day = (daysAgo: number) => at(daysAgo, 0).slice(0, 10);
    // A period well before now: 400 to 200 days ago.
    const period = `from=${day(400)}&to=${day(200)}`;
    await sequelize.query(
      `INSERT INTO nonconformances (number, origin, supplier_id, part_id, description, status, opened_at, closed_at) VALUES
         (:n1, 'found-later', :supplierId, :partId, 'Chipped edge at kitting', 'open', :open10, NULL),
         (:n2, 'found-later', :supplierId, :partId, 'Mark off by a degree', 'dispositioned', :open4, NULL),
         (:n3, 'found-later', :supplierId, :partId, 'Coating stain', 'closed', :inPeriod, :closedAt)`,
      {
        replacements: {
          n1: `NCR-T-${tag}-1`,
          n2: `NCR-T-${tag}-2`,
          n3: `NCR-T-${tag}-3`,
          supplierId,
          partId,
          open10: at(10),
          open4: at(4),
          inPeriod: at(300),
          closedAt: at(290),
        },
      },
    );
    await sequelize.query(
      `INSERT INTO corrective_actions (number, supplier_id, part_id, problem, response_due_on, status, sent_to, requested_by, requested_at, accepted_at, closed_at) VALUES
         (:c1, :supplierId, :partId, 'Chipped edges', :pastDue, 'awaiting-response', 'q@example.test', :buyerId, :open20, NULL, NULL),
         (:c2, :supplierId, :partId, 'Mark errors', :due, 'responded', 'q@example.test', :buyerId, :open6, NULL, NULL),
         (:c3, :supplierId, :partId, 'Coating', :inPeriodDue, 'closed', 'q@example.test', :buyerId, :inPeriod, :acceptedAt, :closedAt)`,
      {
        replacements: {
          c1: `CAR-T-${tag}-1`,
          c2: `CAR-T-${tag}-2`,
          c3: `CAR-T-${tag}-3`,
          supplierId,
          partId,
          buyerId,
          pastDue: day(5),
          due: day(-5),
          inPeriodDue: day(280),
          open20: at(20, 1),
          open6: at(6, 1),
          inPeriod: at(300),
          acceptedAt: at(295),
          closedAt: at(250),
        },
      },
    );
    const { body } = await (await as('buyer')).get(`/api/suppliers/${supplierId}/scorecard?${period}`).expect(200);
    // NCRs open now: 10 and 4 days old (the closed one aside): oldest 10, mean (10 + 4) / 2 = 7;
    // opened in the period: the closed one.
    expect(body.figures.ncrs).toEqual({ open: 2, oldestOpenDays: 10, meanOpenDays: 7, openedInPeriod: 1 });
    // Requests open now: 20 and 6 days old: oldest 20, mean 13; the one awaiting an answer is past
    // its due date; requested in the period: the closed one.
    expect(body.figures.correctiveActions).toEqual({ open: 2, oldestOpenDays: 20, meanOpenDays: 13, overdue: 1, requestedInPeriod: 1 });
    expect(body.figures).toMatchObject({ lotsReceived: 0, acceptanceRate: null, ppm: null, onTimeRate: null });
    expect(body.parts[0].switching).toBeNull();
  });
});

describe('capability and drift of a supplier-part', () => {
  it('gives the lot means, Cp and Cpk of what was measured, and refuses a part not ordered', async () => {
    const people = await historyPeople();
    const { supplierId, partId, tag } = await freshSupplierPart();
    // Two lots of 5 plates: retardance errors by plate index, axis errors all 0.05°.
    const errors = [
      [0.001, -0.001, 0.0005, -0.0005, 0],
      [0.0012, 0.0002, 0.0008, 0.0004, 0.0004],
    ];
    const lotIds: number[] = [];
    for (const [i, lot] of errors.entries()) {
      lotIds.push(
        await recordHistoryLot(people, {
          supplierId,
          partId,
          poNumber: `PO-${tag}-${i}`,
          orderedOn: '2026-05-01',
          quantity: 5,
          serialPrefix: `${tag}-${i}-`,
          supplierLot: `SL-${tag}-${i}`,
          receivedAt: `2026-06-0${i + 1}T10:00:00Z`,
          errors: (index) => ({ retardanceWaves: lot[index], axisDeg: 0.05 }),
        }),
      );
    }
    // Each bench-file commit queued the drift check in its own transaction.
    const [queued] = await sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM pgboss.job WHERE name = 'supplier-drift-check' AND (data->>'lotId')::int IN (:lotIds)`,
      {
        type: QueryTypes.SELECT,
        replacements: { lotIds },
      },
    );
    expect(Number(queued.n)).toBe(2);
    const buyer = await as('buyer');
    const { body } = await buyer.get(`/api/suppliers/${supplierId}/capability?partId=${partId}&${PERIOD}`).expect(200);
    const retardance = body.characteristics.find((c: { characteristic: string }) => c.characteristic === 'retardance');
    // By hand: lot means 0 and 0.0006 λ; all ten plates: mean 0.0003 λ.
    expect(retardance.lots.map((l: { mean: number; pieces: number }) => [l.pieces, l.mean])).toEqual([
      [5, expect.closeTo(0, 9)],
      [5, expect.closeTo(0.0006, 9)],
    ]);
    expect(retardance.lots[0].lot.name).toMatch(/^L-\d+$/);
    expect(retardance.pieces.n).toBe(10);
    expect(retardance.pieces.mean).toBeCloseTo(0.0003, 6);
    // By hand: Σ(x − 0.0003)² = 4.04e-6, s = √(4.04e-6 / 9) = 6.700e-4 λ; Cp = 0.006 / 6s = 1.4926,
    // Cpk = (0.003 − 0.0003) / 3s = 1.3433 (the meter's file rounds each reading: ±0.005).
    expect(retardance.pieces.sd).toBeCloseTo(6.7e-4, 6);
    expect(retardance.capability.cp).toBeCloseTo(1.4926, 2);
    expect(retardance.capability.cpk).toBeCloseTo(1.3433, 2);
    expect(retardance.capability.cpkLow).toBeLessThan(retardance.capability.cpk);
    expect(retardance.tolerance).toBe(0.003);
    // Two lots: too few to judge a drift.
    expect(retardance.ewma).toBeNull();
    expect(body.markOnSlowAxis).toBe(0);

    const other = await freshSupplierPart();
    await buyer.get(`/api/suppliers/${supplierId}/capability?partId=${other.partId}`).expect(404);
    await buyer.get(`/api/suppliers/${supplierId}/capability`).expect(400);
    await (await as('inspector')).get(`/api/suppliers/${supplierId}/capability?partId=${partId}`).expect(403);
  }, 60_000);

  it('raised the alarm of the seeded drifting supplier before its lots failed, and mailed buyer and quality', async () => {
    const [corvane] = await sequelize.query<{ supplier_id: number; part_id: number }>(
      `SELECT s.id AS supplier_id, p.id AS part_id FROM suppliers s, parts p WHERE s.name = 'Corvane Polarisation Works' AND p.number = 'VW-QWP-1064'`,
      { type: QueryTypes.SELECT },
    );
    const { body } = await (await as('buyer')).get(`/api/suppliers/${corvane.supplier_id}/capability?partId=${corvane.part_id}`).expect(200);
    const axis = body.characteristics.find((c: { characteristic: string }) => c.characteristic === 'axis');
    const firstFailing = axis.lots.findIndex((l: { failing: number }) => l.failing > 0);
    expect(firstFailing).toBeGreaterThan(0);
    const [alarm] = body.alarms.filter((a: { characteristic: string }) => a.characteristic === 'axis');
    expect(alarm).toMatchObject({ direction: 'high', failingPieces: 0 });
    const alarmAt = axis.lots.findIndex((l: { lot: { id: number } }) => l.lot.id === alarm.lot.id);
    expect(alarmAt).toBeGreaterThanOrEqual(0);
    expect(alarmAt).toBeLessThan(firstFailing);
    // Every lot up to the alarm passed.
    expect(axis.lots.slice(0, alarmAt + 1).every((l: { failing: number }) => l.failing === 0)).toBe(true);
    // The steady supplier of the demo raised none.
    const [steady] = await sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM drift_alarms a JOIN suppliers s ON s.id = a.supplier_id WHERE s.name = 'Quillmere Crystal Foundry'`,
      { type: QueryTypes.SELECT },
    );
    expect(Number(steady.n)).toBe(0);

    const [mail] = await sequelize.query<{ recipients: string[]; subject: string; body_text: string }>(
      `SELECT m.recipients, m.subject, m.body_text FROM drift_alarms a JOIN mail_outbox m ON m.id = a.mail_id WHERE a.id = :id`,
      { type: QueryTypes.SELECT, replacements: { id: alarm.id } },
    );
    expect(mail.recipients).toEqual(expect.arrayContaining(['buyer@phaselot.test', 'quality@phaselot.test']));
    expect(mail.subject).toBe(`Drift alarm: fast-axis error of VW-QWP-1064 from Corvane Polarisation Works (lot ${alarm.lot.name})`);
    expect(mail.body_text).toContain(`/supplier-performance/${corvane.supplier_id}?partId=${corvane.part_id}`);

    // Checking again raises nothing new: the excursion already has its alarm.
    const before = body.alarms.length;
    expect(await checkDrift(corvane.supplier_id, corvane.part_id)).toEqual([]);
    const again = await (await as('buyer')).get(`/api/suppliers/${corvane.supplier_id}/capability?partId=${corvane.part_id}`).expect(200);
    expect(again.body.alarms).toHaveLength(before);
  });
});

describe('due dates of PO lines', () => {
  it('keeps a line’s due date and refuses one before the order date', async () => {
    const { supplierId, partId } = await freshSupplierPart();
    const buyer = await as('buyer');
    const line = { partId, quantity: 5, unitPrice: 1, inspectionLevel: 'II', aql: 1 };
    const order = { number: `PO-${uniqueTag()}`, supplierId, orderedOn: '2026-05-01', currency: 'EUR' };
    const created = await buyer
      .post('/api/purchase-orders')
      .send({ ...order, lines: [{ ...line, dueOn: '2026-05-20' }, line] })
      .expect(201);
    expect(created.body.lines.map((l: { dueOn: string | null }) => l.dueOn)).toEqual(['2026-05-20', null]);
    const early = await buyer
      .post('/api/purchase-orders')
      .send({ ...order, number: `PO-${uniqueTag()}`, lines: [{ ...line, dueOn: '2026-04-30' }] })
      .expect(400);
    expect(early.body.error.details).toEqual([{ path: 'lines.0.dueOn', message: 'Due on or after the order date' }]);
  });
});
