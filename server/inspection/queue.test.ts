// The inspection queue is one paged list read in one query. Each row must say what the lot's own
// inspection record says (the per-lot evaluation the lot page uses): plan, sample, how much of it is
// measured, the proposal under ISO 2859-1 single sampling, and what a 100 % sort still needs.
import { afterEach, describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { as } from '../../tests/helpers/api';
import { benchFile, sampleOf, signDecision, uploadBench } from '../../tests/helpers/bench';
import { receivedLot } from '../../tests/helpers/receivedLot';

type Row = {
  lotId: number;
  state: string;
  plan: Record<string, unknown> | null;
  sampleSerials: string[];
  measured: number;
  sortRemaining: number | null;
  proposal: string | null;
  receivedAt: string;
};

async function queued(lotId: number): Promise<Row> {
  const found = await (
    await as('inspector')
  )
    .get('/api/inspection/queue')
    .query({ q: `L-${lotId}` })
    .expect(200);
  const row = found.body.data.find((r: Row) => r.lotId === lotId);
  expect(row, `L-${lotId} in the queue`).toBeDefined();
  return row;
}

/** The queue's row against the lot's own inspection record. */
async function expectAsOnItsPage(lotId: number) {
  const [row, { view, sample }] = await Promise.all([queued(lotId), sampleOf(lotId)]);
  expect(row).toMatchObject({
    state: view.lot.state,
    plan: {
      codeLetter: view.plan.codeLetter,
      planLetter: view.plan.planLetter,
      sampleSize: view.plan.sampleSize,
      accept: view.plan.accept,
      reject: view.plan.reject,
      severity: view.plan.severity,
    },
    sampleSerials: sample,
    measured: view.verdict.measured,
    proposal: view.verdict.proposal,
    sortRemaining: view.sort?.remaining ?? null,
  });
  return row;
}

let hooked: string | null = null;
afterEach(() => {
  if (hooked) sequelize.removeHook('beforeQuery', hooked);
  hooked = null;
});

/** The number of SQL statements the app runs for one request. */
async function statementsOf(url: string) {
  const client = await as('inspector');
  let statements = 0;
  hooked = `count-${Math.random()}`;
  sequelize.addHook('beforeQuery', hooked, () => {
    statements++;
  });
  const response = await client.get(url).expect(200);
  sequelize.removeHook('beforeQuery', hooked);
  hooked = null;
  return { statements, rows: response.body.data.length as number };
}

describe('GET /api/inspection/queue', () => {
  it('gives each lot its plan, sample, measured count and proposal as its inspection record does', async () => {
    const untouched = await receivedLot({ quantity: 20 });
    await expectAsOnItsPage(untouched.lotId);

    // Half the sample measured, one piece out of tolerance; then that piece measured again within it.
    const partly = await receivedLot({ quantity: 30 });
    const { sample } = await sampleOf(partly.lotId);
    const half = sample.slice(0, Math.ceil(sample.length / 2));
    await uploadBench(partly.lotId, 'half.csv', benchFile(half, [half[0]]));
    // One defective reaches Re 1 of this plan (Ac 0) even before the rest is measured.
    expect(await expectAsOnItsPage(partly.lotId)).toMatchObject({ proposal: 'reject', plan: { accept: 0, reject: 1 } });
    await uploadBench(partly.lotId, 'again.csv', benchFile([half[0]]));
    expect(await expectAsOnItsPage(partly.lotId)).toMatchObject({ proposal: 'undecided', measured: half.length });

    const whole = await receivedLot({ quantity: 30 });
    await uploadBench(whole.lotId, 'whole.csv', benchFile((await sampleOf(whole.lotId)).sample));
    expect(await expectAsOnItsPage(whole.lotId)).toMatchObject({ state: 'awaiting-disposition', proposal: 'accept' });

    // A 100 % sort: the pieces outside the sample still need a verdict, fewer after each file.
    const sorted = await receivedLot({ quantity: 30 });
    const sortSample = (await sampleOf(sorted.lotId)).sample;
    await uploadBench(sorted.lotId, 'sample.csv', benchFile(sortSample, sortSample.slice(0, 2)));
    expect((await expectAsOnItsPage(sorted.lotId)).proposal).toBe('reject');
    await signDecision(sorted.lotId, 'sort', null, { justification: 'Sort at our bench, agreed with the supplier' });
    const rest = (await sampleOf(sorted.lotId)).pieces.filter((p) => !p.inSample).map((p) => p.serial);
    expect((await expectAsOnItsPage(sorted.lotId)).sortRemaining).toBe(rest.length);
    await uploadBench(sorted.lotId, 'sort-1.csv', benchFile(rest.slice(0, 5), [rest[0]]));
    expect((await expectAsOnItsPage(sorted.lotId)).sortRemaining).toBe(rest.length - 5);
  });

  it('pages oldest first and reads a page of any length with the same few statements', async () => {
    for (let i = 0; i < 4; i++) await receivedLot({ quantity: 8 });
    const inspector = await as('inspector');
    const first = (await inspector.get('/api/inspection/queue').query({ pageSize: 3 }).expect(200)).body;
    expect(first.data).toHaveLength(3);
    expect(first.totalExact).toBe(true);
    expect(first.total).toBeGreaterThanOrEqual(4);
    const second = (await inspector.get('/api/inspection/queue').query({ pageSize: 3, page: 2 }).expect(200)).body;
    const received = [...first.data, ...second.data].map((r: Row) => r.receivedAt);
    expect(received).toEqual([...received].sort());
    expect(second.data.map((r: Row) => r.lotId)).not.toContain(first.data[0].lotId);

    // No statement per lot: one page, and a count on the first (the session check aside).
    const one = await statementsOf('/api/inspection/queue?pageSize=1&page=2');
    const many = await statementsOf('/api/inspection/queue?pageSize=4&page=2');
    expect(one.rows).toBe(1);
    expect(many.rows).toBe(4);
    expect(many.statements).toBe(one.statements);
    const counted = await statementsOf('/api/inspection/queue?pageSize=4');
    expect(counted.statements).toBe(many.statements + 1);
    await inspector.get('/api/inspection/queue').query({ sort: 'sampleSerials' }).expect(400);
  });
});
