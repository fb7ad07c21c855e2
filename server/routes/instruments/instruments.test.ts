import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';

const bench = (code: string) => ({
  code,
  kind: 'stokes-polarimeter',
  description: 'Six-state polarimeter, HeNe source',
  uncertaintyWaves: 0.0008,
  uncertaintyDeg: 0.05,
  calibratedOn: '2026-06-01',
  calibrationDueOn: '2027-06-01',
});

describe('/api/instruments', () => {
  it('lets the quality manager register and recalibrate an instrument', async () => {
    const quality = await as('quality');
    const created = await quality
      .post('/api/instruments')
      .send(bench(`T-BENCH-${Date.now()}`))
      .expect(201);
    expect(created.body).toMatchObject({ s3Sign: 1, angleSign: 1, uncertaintyWaves: 0.0008, calibrationCurrent: true });
    const expired = await quality
      .put(`/api/instruments/${created.body.id}`)
      .send({ ...bench(created.body.code), s3Sign: -1, calibratedOn: '2025-01-10', calibrationDueOn: '2026-01-10' })
      .expect(200);
    expect(expired.body).toMatchObject({ s3Sign: -1, calibrationCurrent: false });
    const list = await (await as('auditor')).get('/api/instruments').expect(200);
    expect(list.body.data.map((i: { code: string }) => i.code)).toContain(created.body.code);
  });

  it('refuses a due date before the calibration date and an unknown kind', async () => {
    const quality = await as('quality');
    const response = await quality
      .post('/api/instruments')
      .send({ ...bench('T-BAD'), kind: 'oscilloscope', calibrationDueOn: '2026-01-01' })
      .expect(400);
    expect(response.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['kind']);
    const dates = await quality
      .post('/api/instruments')
      .send({ ...bench('T-BAD'), calibrationDueOn: '2026-01-01' })
      .expect(400);
    expect(dates.body.error.details).toEqual([{ path: 'calibrationDueOn', message: 'The due date must come after the calibration date' }]);
  });

  it('does not let an inspector or auditor change the register', async () => {
    await (await as('inspector')).post('/api/instruments').send(bench('T-NOPE')).expect(403);
    await (await as('auditor')).post('/api/instruments').send(bench('T-NOPE')).expect(403);
  });
});
