// Switching between normal, tightened and discontinued inspection through the API, with lots
// received through the clerk's API (plans are drawn at receipt). Rules of ISO 2859-1:1999, clause 9
// (from memory): 2 of 5 or fewer consecutive lots not accepted on normal → tightened (9.3.1); 5 lots
// not accepted while on tightened → acceptance discontinued, resumed on tightened once the supplier
// has acted (9.4).
import { beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../../db';
import { planFor } from '../../../shared/sampling';
import { as } from '../../../tests/helpers/api';
import { DEMO_PASSWORD as PASSWORD, decide, inspectionOf, sign, supplierPart } from '../../../tests/helpers/switching';

let inspector: Awaited<ReturnType<typeof as>>;
let quality: Awaited<ReturnType<typeof as>>;
beforeAll(async () => {
  inspector = await as('inspector');
  quality = await as('quality');
});

const switchingOf = async (pair: { supplierId: number; partId: number }) =>
  (await quality.get(`/api/switching/${pair.supplierId}/${pair.partId}`).expect(200)).body;

describe('a lot keeps the plan it was sampled under', () => {
  it('decides the third lot sampled on normal after two rejections switched its supplier and part to tightened', async () => {
    const pair = await supplierPart();
    const lots = [await pair.receive(), await pair.receive(), await pair.receive()];
    // Lot of 60 at level II: code letter E; AQL 1.0 on normal is n = 13, Ac 0, Re 1 (ISO 2859-1 Tables 1
    // and 2-A, from memory; shared/sampling/tables.test.ts checks every cell against a published encoding).
    const third = await inspectionOf(lots[2].lotId);
    expect(third.view.plan).toMatchObject({ severity: 'normal', sampleSize: 13, accept: 0, reject: 1 });

    await decide(lots[0].lotId, 'reject');
    await decide(lots[1].lotId, 'reject');
    expect((await switchingOf(pair)).phase).toBe('tightened');

    const { plan } = await decide(lots[2].lotId, 'accept');
    expect(plan).toMatchObject({ severity: 'normal', sampleSize: 13 });
    expect((await inspectionOf(lots[2].lotId)).view.lot.state).toBe('accepted');

    const view = await switchingOf(pair);
    // An acceptance on the normal plan does not count toward the 5 that end tightened inspection.
    expect(view.state).toMatchObject({ severity: 'tightened', consecutiveAccepted: 0, tightenedCount: 0, stopped: false });
    expect(view.history.map((h: { lotId: number; from: string; to: string }) => [h.lotId, h.from, h.to])).toEqual([
      [lots[2].lotId, 'tightened', 'tightened'],
      [lots[1].lotId, 'normal', 'tightened'],
      [lots[0].lotId, 'normal', 'normal'],
    ]);
    expect(view.history[0]).toMatchObject({ sampledOn: 'normal', accepted: true, decision: 'accept', by: expect.any(String) });
    expect(view.history[0].explanation).toMatch(/accepted on normal inspection while tightened inspection is in effect/);
    expect(view.history[1].explanation).toMatch(/2 of the last 2 lots not accepted, so tightened inspection begins/);

    // The next receipt is sampled on tightened (its cells are checked in shared/sampling/tables.test.ts).
    const fourth = await pair.receive();
    const tightened = planFor({ lotSize: 60, level: 'II', aql: 1, severity: 'tightened' });
    expect((await inspectionOf(fourth.lotId)).view.plan).toMatchObject({
      severity: 'tightened',
      sampleSize: tightened.sampleSize,
      accept: tightened.accept,
      reject: tightened.reject,
    });
  });
});

describe('discontinuation and resumption', () => {
  it('records receipts while acceptance is discontinued, marked and without a plan, and draws their plans on tightened when a quality manager resumes', async () => {
    const pair = await supplierPart();
    // Two not accepted on normal start tightened; five not accepted on tightened discontinue acceptance.
    for (let i = 0; i < 7; i++) await decide((await pair.receive(5)).lotId, 'reject');
    let view = await switchingOf(pair);
    expect(view.phase).toBe('stopped');
    expect(view.state).toMatchObject({ stopped: true, tightenedCount: 5 });
    expect(view.history[0].explanation).toMatch(/5 lots not accepted on tightened inspection, so acceptance is discontinued/);

    const waiting = await pair.receive(30);
    expect(waiting.state).toBe('quarantine');
    const [{ plans }] = await sequelize.query<{ plans: string }>('SELECT count(*) AS plans FROM lot_inspections WHERE lot_id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: waiting.lotId },
    });
    expect(Number(plans)).toBe(0);
    // Marked on the lot list, the lot page and the inspection queue; its inspection record says why.
    const listed = await quality
      .get('/api/lots')
      .query({ q: `L-${waiting.lotId}` })
      .expect(200);
    expect(listed.body.data.find((l: { id: number }) => l.id === waiting.lotId)).toMatchObject({ acceptanceDiscontinued: true });
    expect((await quality.get(`/api/lots/${waiting.lotId}`).expect(200)).body.acceptanceDiscontinued).toBe(true);
    const queue = await inspector
      .get('/api/inspection/queue')
      .query({ q: `L-${waiting.lotId}` })
      .expect(200);
    expect(queue.body.data.find((r: { lotId: number }) => r.lotId === waiting.lotId)).toMatchObject({ acceptanceDiscontinued: true, plan: null });
    const refused = await inspector.get(`/api/inspection/lots/${waiting.lotId}`).expect(409);
    expect(refused.body.error).toMatchObject({ code: 'acceptance_discontinued', details: { supplierId: pair.supplierId, partId: pair.partId } });
    view = await switchingOf(pair);
    expect(view.waitingLots.map((l: { id: number }) => l.id)).toEqual([waiting.lotId]);

    // An override does not lift a discontinuation; nor does a refused signature or a missing action.
    const resume = (body: Record<string, unknown>) => quality.post(`/api/switching/${pair.supplierId}/${pair.partId}/resume`).send(body);
    const action = {
      correctiveAction: 'Supplier replaced the worn polishing pitch and added a final retardance check on every plate.',
      reference: 'SCAR-2026-031',
      meaningAcknowledged: true,
    };
    const override = await quality
      .post(`/api/switching/${pair.supplierId}/${pair.partId}/override`)
      .send({ severity: 'normal', reason: 'Trying to skip the resumption', password: PASSWORD, meaningAcknowledged: true })
      .expect(409);
    expect(override.body.error.message).toMatch(/discontinued: resume it/);
    expect((await resume({ ...action, password: 'not-my-password' }).expect(401)).body.error.code).toBe('signature_refused');
    await resume({ password: PASSWORD, reference: 'X', meaningAcknowledged: true }).expect(400);
    await (
      await as('inspector')
    )
      .post(`/api/switching/${pair.supplierId}/${pair.partId}/resume`)
      .send({ ...action, password: PASSWORD })
      .expect(403);
    expect((await switchingOf(pair)).phase).toBe('stopped');

    const resumed = await resume({ ...action, password: PASSWORD }).expect(201);
    expect(resumed.body).toMatchObject({ state: { severity: 'tightened', stopped: false, tightenedCount: 0 }, plansDrawnFor: [waiting.lotId] });
    // Lot of 30 at level II: code letter D; the plan is the tightened one at AQL 1.0 (compared with the product's look-up).
    const tightened = planFor({ lotSize: 30, level: 'II', aql: 1, severity: 'tightened' });
    const drawn = await inspectionOf(waiting.lotId);
    expect(drawn.view.plan).toMatchObject({ severity: 'tightened', accept: tightened.accept, reject: tightened.reject });
    expect(drawn.sample).toHaveLength(Math.min(tightened.sampleSize, 30));
    expect((await quality.get(`/api/lots/${waiting.lotId}`).expect(200)).body.acceptanceDiscontinued).toBe(false);

    view = await switchingOf(pair);
    expect(view.history[0]).toMatchObject({
      kind: 'resume',
      from: 'stopped',
      to: 'tightened',
      reason: action.correctiveAction,
      reference: action.reference,
      by: expect.any(String),
    });
    await quality
      .post(`/api/switching/${pair.supplierId}/${pair.partId}/resume`)
      .send({ ...action, password: PASSWORD })
      .expect(409);

    const [audit] = await sequelize.query<{ after: { reference: string; plansDrawnFor: number[] } }>(
      `SELECT after FROM audit_events WHERE action = 'switching.resume' AND entity_id = :id ORDER BY id DESC LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { id: `${pair.supplierId}/${pair.partId}` } },
    );
    expect(audit.after).toMatchObject({ reference: 'SCAR-2026-031', plansDrawnFor: [waiting.lotId] });
    const lotHistory = (await quality.get(`/api/lots/${waiting.lotId}`).expect(200)).body.history.map((h: { what: string }) => h.what);
    expect(lotHistory).toContain('Plan drawn');
  });
});

describe('severity override', () => {
  it('puts a supplier and part on another severity for a stated, signed and audited reason', async () => {
    const pair = await supplierPart();
    const url = `/api/switching/${pair.supplierId}/${pair.partId}/override`;
    await quality.post(url).send({ severity: 'tightened', password: PASSWORD, meaningAcknowledged: true }).expect(400);
    await quality.post(url).send({ severity: 'normal', reason: 'Already there, nothing to change', password: PASSWORD, meaningAcknowledged: true }).expect(409);
    await (
      await as('buyer')
    )
      .post(url)
      .send({ severity: 'tightened', reason: 'Field returns from two customers', password: PASSWORD, meaningAcknowledged: true })
      .expect(403);
    const reason = 'Field returns from two customers show axis marks off by 2 degrees';
    const overridden = await quality.post(url).send({ severity: 'tightened', reason, password: PASSWORD, meaningAcknowledged: true }).expect(201);
    expect(overridden.body.state).toMatchObject({ severity: 'tightened', stopped: false });

    const view = await switchingOf(pair);
    expect(view.history).toEqual([expect.objectContaining({ kind: 'override', severity: 'tightened', reason, from: 'normal', to: 'tightened', lotId: null })]);
    const lot = await pair.receive();
    expect((await inspectionOf(lot.lotId)).view.plan.severity).toBe('tightened');
    const [audit] = await sequelize.query<{ after: { reason: string; severity: string } }>(
      `SELECT after FROM audit_events WHERE action = 'switching.override' AND entity_id = :id`,
      {
        type: QueryTypes.SELECT,
        replacements: { id: `${pair.supplierId}/${pair.partId}` },
      },
    );
    expect(audit.after).toMatchObject({ reason, severity: 'tightened' });
    // Buyers, inspectors and auditors read the switching state.
    for (const role of ['buyer', 'inspector', 'auditor'] as const) await (await as(role)).get(`/api/switching/${pair.supplierId}/${pair.partId}`).expect(200);
    await (await as('clerk')).get(`/api/switching/${pair.supplierId}/${pair.partId}`).expect(403);
    const listed = await (await as('auditor')).get('/api/switching').query({ supplierId: pair.supplierId }).expect(200);
    expect(listed.body.data).toEqual([expect.objectContaining({ partId: pair.partId, phase: 'tightened', switchingScore: 0 })]);
  });
});

describe('a superseding decision', () => {
  it('replaces the lot’s result in its place in the sequence and recomputes the state', async () => {
    const pair = await supplierPart();
    const first = await pair.receive();
    const second = await pair.receive();
    const accepted = await decide(first.lotId, 'accept');
    await decide(second.lotId, 'reject');
    expect((await switchingOf(pair)).state).toMatchObject({ severity: 'normal', recentResults: [true, false] });

    // The acceptance of the first lot is superseded by a rejection: 2 of the last 2 lots not accepted.
    expect((await sign(first.lotId, 'reject', accepted.dispositionId, { justification: 'Chipped edges found at kitting' })).status).toBe(201);
    const view = await switchingOf(pair);
    expect(view.phase).toBe('tightened');
    expect(view.history[0]).toMatchObject({
      lotId: first.lotId,
      position: 1,
      accepted: false,
      decision: 'reject',
      from: 'normal',
      to: 'tightened',
      superseded: false,
    });
    expect(view.history[0].explanation).toMatch(/result was replaced by a new decision \(accepted, 0 defectives → not accepted, 0 defectives\)/);
    expect(view.history.find((h: { lotId: number; superseded: boolean }) => h.lotId === first.lotId && h.superseded)).toMatchObject({
      accepted: true,
      position: 1,
    });
  });
});

describe('reading writes nothing', () => {
  it('leaves plans, samples, switching and the audit trail as they were after the queue, the lot pages and the switching pages are read', async () => {
    const pair = await supplierPart();
    const lot = await pair.receive();
    const clients = { quality, inspector, auditor: await as('auditor') };
    const count = async () =>
      sequelize.query<Record<string, string>>(
        `SELECT (SELECT count(*) FROM lot_inspections) AS plans, (SELECT count(*) FROM sample_pieces) AS samples, (SELECT count(*) FROM switching_states) AS states,
                (SELECT count(*) FROM switching_events) AS events, (SELECT count(*) FROM audit_events) AS audit`,
        { type: QueryTypes.SELECT },
      );
    const before = await count();
    await clients.inspector.get('/api/inspection/queue').expect(200);
    await clients.inspector.get(`/api/inspection/lots/${lot.lotId}`).expect(200);
    await clients.auditor.get(`/api/lots/${lot.lotId}`).expect(200);
    await clients.auditor.get('/api/lots').expect(200);
    await clients.quality.get('/api/switching').expect(200);
    await clients.quality.get(`/api/switching/${pair.supplierId}/${pair.partId}`).expect(200);
    expect(await count()).toEqual(before);
  });
});
