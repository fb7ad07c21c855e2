// The deviation register. That a deviation (concession) is granted in writing for a stated quantity
// and period, approved by quality and a second authority, and may not be used beyond either, is
// common practice of supplier quality management; these tests hold Phaselot to it.
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { DEMO_PASSWORD } from '../../../db/seeders/demo';
import { app, as, freshUser } from '../../../tests/helpers/api';
import { approvedDeviation, rejectedSample, useAsIs } from '../../../tests/helpers/deviations';
import { sampleOf } from '../../../tests/helpers/bench';
import { sign, supplierPart } from '../../../tests/helpers/switching';

const SIGN = { password: DEMO_PASSWORD, meaningAcknowledged: true };
const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

/** The response, once its status is checked (the body is shown when it differs). */
async function status(pending: Promise<{ status: number; body: { error?: { message: string } } }>, expected: number) {
  const response = await pending;
  expect(response.status, JSON.stringify(response.body)).toBe(expected);
  return response as typeof response & { body: { error: { code: string; message: string } } };
}

const entry = async (id: number) => (await (await as('auditor')).get(`/api/deviations/${id}`).expect(200)).body;

describe('/api/deviations', () => {
  it('numbers each entry and needs a quality manager and then another user to approve it; an approved entry is frozen', async () => {
    const pair = await supplierPart();
    const buyer = await as('buyer');
    const body = {
      supplierId: pair.supplierId,
      partId: pair.partId,
      allowed: 'Retardance tolerance widened to ±0.005 λ',
      retardanceTolWaves: 0.005,
      quantityLimit: 40,
      expiresOn: inDays(20),
    };
    const created = await buyer.post('/api/deviations').send(body).expect(201);
    expect(created.body).toMatchObject({
      number: expect.stringMatching(/^DEV-\d{4}-\d{4}$/),
      status: 'awaiting-approval',
      approvals: 0,
      quantityLeft: 40,
      retardanceTolWaves: 0.005,
    });
    const id = created.body.id;

    // Bad input is refused field by field; the past is no expiry.
    const bad = await buyer
      .post('/api/deviations')
      .send({ ...body, allowed: 'short', quantityLimit: 0, expiresOn: '2020-01-01' })
      .expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['allowed', 'expiresOn', 'quantityLimit']);

    // Editable until someone approves it.
    await buyer
      .put(`/api/deviations/${id}`)
      .send({ ...body, quantityLimit: 30 })
      .expect(200);

    // The first approval is a quality manager's: an administrator cannot give it.
    const admin = await as('admin');
    expect((await admin.post(`/api/deviations/${id}/approvals`).send(SIGN).expect(409)).body.error.message).toMatch(/first approval .* is a quality manager's/);
    const quality = await as('quality');
    expect(
      (
        await quality
          .post(`/api/deviations/${id}/approvals`)
          .send({ ...SIGN, password: 'not-the-password' })
          .expect(401)
      ).body.error.code,
    ).toBe('signature_refused');
    const first = await quality.post(`/api/deviations/${id}/approvals`).send(SIGN).expect(201);
    expect(first.body).toMatchObject({ status: 'awaiting-approval', approvals: 1 });

    // The same person cannot give the second approval.
    const again = await quality.post(`/api/deviations/${id}/approvals`).send(SIGN).expect(409);
    expect(again.body.error.message).toMatch(/second approval must come from another user/);
    expect((await buyer.put(`/api/deviations/${id}`).send(body).expect(409)).body.error.message).toMatch(/approval signed: what was approved cannot change/);

    // Another quality manager may be the second approver.
    const colleague = await freshUser(['quality']);
    const signIn = await request(app).post('/api/auth/login').send({ email: colleague.email, password: colleague.password }).expect(200);
    const second = await request(app)
      .post(`/api/deviations/${id}/approvals`)
      .set('Authorization', `Bearer ${signIn.body.token}`)
      .send({ ...SIGN, password: colleague.password })
      .expect(201);
    expect(second.body).toMatchObject({ status: 'current', approvals: 2, quantityLimit: 30 });
    expect(second.body.approvalsSigned.map((a: { slot: string; approver: string }) => [a.slot, a.approver])).toEqual([
      ['quality', expect.any(String)],
      ['second', colleague.user.name],
    ]);
    await admin.post(`/api/deviations/${id}/approvals`).send(SIGN).expect(409);

    const [audit] = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM audit_events WHERE entity_type = 'deviation' AND entity_id = :id AND action = 'deviation.approve'`,
      {
        type: QueryTypes.SELECT,
        replacements: { id: String(id) },
      },
    );
    expect(audit.n).toBe(2);
  });

  it("takes a use-as-is lot's pieces from the deviation until it is used up; a superseded decision gives them back", async () => {
    const pair = await supplierPart();
    const deviation = await approvedDeviation(pair.supplierId, pair.partId, { quantityLimit: 30 });
    const first = await rejectedSample(pair);
    const signed = await useAsIs(first, deviation.id);
    expect(signed.status, JSON.stringify(signed.body)).toBe(201);
    expect(await entry(deviation.id)).toMatchObject({
      status: 'current',
      quantityUsed: 20,
      quantityLeft: 10,
      uses: [{ lotId: first, source: 'lot', quantity: 20, releasedAt: null }],
    });

    // A second lot of 20 does not fit in the 10 pieces left.
    const second = await rejectedSample(pair);
    const refused = await useAsIs(second, deviation.id);
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatchObject({
      code: 'deviation_not_usable',
      message: `Deviation ${deviation.number} covers 10 more pieces of its 30; this decision releases 20`,
    });

    // Superseding the first lot's decision gives its 20 pieces back; the second lot then takes them.
    expect((await sign(first, 'reject', signed.body.dispositionId, { justification: 'Deviation needed elsewhere' })).status).toBe(201);
    expect(await entry(deviation.id)).toMatchObject({ quantityUsed: 0, quantityLeft: 30 });
    await status(useAsIs(second, deviation.id), 201);

    // A deviation sized to the lot is used up by it and then refuses any further lot.
    const exact = await approvedDeviation(pair.supplierId, pair.partId, { quantityLimit: 20 });
    const third = await rejectedSample(pair);
    await status(useAsIs(third, exact.id), 201);
    expect(await entry(exact.id)).toMatchObject({ status: 'exhausted', quantityLeft: 0 });
    const fourth = await rejectedSample(pair);
    expect((await status(useAsIs(fourth, exact.id), 409)).body.error.message).toBe(`Deviation ${exact.number} is used up: its 20 pieces are all taken`);
    const lot = (await (await as('auditor')).get(`/api/lots/${fourth}`).expect(200)).body;
    expect(lot.state).toBe('awaiting-disposition');
  });

  it('refuses a deviation that is expired, not fully approved, withdrawn, for another part or narrower than what was measured', async () => {
    const pair = await supplierPart();
    const lotId = await rejectedSample(pair);

    const expired = await approvedDeviation(pair.supplierId, pair.partId);
    // The calendar moves on: the expiry day was yesterday.
    await sequelize.query(`UPDATE deviations SET expires_on = (now() AT TIME ZONE 'UTC')::date - 1 WHERE id = :id`, { replacements: { id: expired.id } });
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    expect((await status(useAsIs(lotId, expired.id), 409)).body.error.message).toBe(`Deviation ${expired.number} expired on ${yesterday}`);
    expect((await entry(expired.id)).status).toBe('expired');

    const buyer = await as('buyer');
    const pending = await buyer
      .post('/api/deviations')
      .send({
        supplierId: pair.supplierId,
        partId: pair.partId,
        allowed: 'Axis mark tolerance widened to ±1°',
        axisTolDeg: 1,
        quantityLimit: 50,
        expiresOn: inDays(5),
      })
      .expect(201);
    await (await as('quality')).post(`/api/deviations/${pending.body.id}/approvals`).send(SIGN).expect(201);
    expect((await status(useAsIs(lotId, pending.body.id), 409)).body.error.message).toBe(
      `Deviation ${pending.body.number} is not approved yet (1 of 2 approvals signed)`,
    );

    const withdrawn = await approvedDeviation(pair.supplierId, pair.partId);
    await buyer.post(`/api/deviations/${withdrawn.id}/withdrawal`).send({ reason: 'Engineering no longer accepts the wider tolerance' }).expect(200);
    expect((await status(useAsIs(lotId, withdrawn.id), 409)).body.error.message).toBe(
      `Deviation ${withdrawn.number} was withdrawn: Engineering no longer accepts the wider tolerance`,
    );

    const other = await supplierPart();
    const elsewhere = await approvedDeviation(other.supplierId, other.partId);
    expect((await status(useAsIs(lotId, elsewhere.id), 409)).body.error.message).toBe(`Deviation ${elsewhere.number} is for another supplier or part`);

    // An entry recorded before the register (from an earlier decision's free-text number) covers no new decision.
    const [earlier] = await sequelize.query<{ id: number }>(
      `INSERT INTO deviations (number, supplier_id, part_id, allowed, recorded_before_register) VALUES ('DEV-OLD-3', :supplierId, :partId, 'Recorded before the register', true) RETURNING id`,
      { type: QueryTypes.SELECT, replacements: { supplierId: pair.supplierId, partId: pair.partId } },
    );
    expect((await status(useAsIs(lotId, earlier.id), 409)).body.error.message).toBe(
      'Deviation DEV-OLD-3 was recorded before the register from an earlier decision and covers no new one',
    );
    expect((await entry(earlier.id)).status).toBe('earlier');

    // A deviation that widens the retardance tolerance covers only plates measured inside the wider
    // tolerance: the failing plates of this lot are 0.006 λ long (the bench fixture's "bad" plates).
    const tooNarrow = await approvedDeviation(pair.supplierId, pair.partId, { retardanceTolWaves: 0.005 });
    const narrow = await status(useAsIs(lotId, tooNarrow.id), 409);
    const { sample } = await sampleOf(lotId);
    expect(narrow.body.error.message).toBe(
      `Deviation ${tooNarrow.number} widens the tolerance to retardance ±0.005 λ; these pieces were measured outside it: ${sample[0]}`,
    );

    // Nothing was signed or moved by the refusals.
    expect((await (await as('auditor')).get(`/api/lots/${lotId}`).expect(200)).body.state).toBe('awaiting-disposition');

    const wideEnough = await approvedDeviation(pair.supplierId, pair.partId, { retardanceTolWaves: 0.01 });
    await status(useAsIs(lotId, wideEnough.id), 201);
  });

  it('lists the register with each entry’s standing, filters by supplier, part and status, and exports CSV', async () => {
    const pair = await supplierPart();
    const current = await approvedDeviation(pair.supplierId, pair.partId, { quantityLimit: 12 });
    const buyer = await as('buyer');
    await buyer
      .post('/api/deviations')
      .send({
        supplierId: pair.supplierId,
        partId: pair.partId,
        allowed: 'Cosmetic digs up to 0.1 mm outside the clear aperture',
        quantityLimit: 5,
        expiresOn: inDays(3),
      })
      .expect(201);

    const all = (await buyer.get(`/api/deviations?supplierId=${pair.supplierId}&partId=${pair.partId}`).expect(200)).body;
    expect(all.total).toBe(2);
    const usable = (await buyer.get(`/api/deviations?supplierId=${pair.supplierId}&status=current`).expect(200)).body;
    expect(usable.data.map((d: { number: string }) => d.number)).toEqual([current.number]);
    await buyer.get('/api/deviations?sort=password').expect(400);

    const csv = await buyer.get(`/api/deviations/export.csv?supplierId=${pair.supplierId}&sort=number`).expect(200);
    const lines = csv.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\n');
    expect(lines[0]).toBe(
      'number,supplier,part,allowed,retardance_tolerance_waves,axis_tolerance_deg,quantity_limit,quantity_used,expires_on,approvals,status',
    );
    expect(lines).toHaveLength(3);
    expect(lines[1]).toContain(`${current.number},`);
    expect(lines[1]).toMatch(/,12,0,\d{4}-\d{2}-\d{2},2,current$/);
  });
});
