// GET /api/sampling/plan. Expected plans are those of the single sampling tables as encoded in the
// AQLSchemes R package (R/AAZ14Single.R, copied whole into shared/sampling/tables.test.ts); the
// cells used are quoted beside each check.
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { app, as } from '../../../tests/helpers/api';
import { ROLES } from '../../../shared/schemas/roles';

describe('GET /api/sampling/plan', () => {
  it('answers every signed-in role with both letters, the table n, Ac, Re and the severity', async () => {
    // 400 pieces at level II: code letter H (Table 1, row 281-500). Tightened at AQL 0.65: H, J ↓ to
    // K, n = 125, Ac 1 / Re 2 (tightened ss row H col 0.65 = 125, c10 = 1, re c10 = 2).
    for (const role of ROLES) {
      const response = await (await as(role)).get('/api/sampling/plan?lotSize=400&level=II&aql=0.65&severity=tightened').expect(200);
      expect(response.body, role).toEqual({
        codeLetter: 'H',
        planLetter: 'K',
        sampleSize: 125,
        accept: 1,
        reject: 2,
        severity: 'tightened',
        hundredPercent: false,
      });
    }
  });

  it('gives reduced plans with their gap, and 100 % when n reaches the lot size', async () => {
    const inspector = await as('inspector');
    // 2000 at II: K; reduced at AQL 1.0: n = 50, Ac 1 / Re 4 (reduced ss row K col 1.0 = 50, c11 = 1, re c11 = 4).
    expect((await inspector.get('/api/sampling/plan?lotSize=2000&level=II&aql=1&severity=reduced').expect(200)).body).toMatchObject({
      codeLetter: 'K',
      planLetter: 'K',
      sampleSize: 50,
      accept: 1,
      reject: 4,
    });
    // 10 at II: B; normal at AQL 1.0: ↓ to E, n = 13 ≥ 10 (normal ss row B col 1.0 = 13).
    expect((await inspector.get('/api/sampling/plan?lotSize=10&level=II&aql=1.0&severity=normal').expect(200)).body).toMatchObject({
      codeLetter: 'B',
      planLetter: 'E',
      sampleSize: 13,
      hundredPercent: true,
    });
  });

  it('refuses a query that names no plan, field by field', async () => {
    const clerk = await as('clerk');
    const bad = await clerk.get('/api/sampling/plan?lotSize=0&level=IV&aql=0.3').expect(400);
    expect(bad.body.error.code).toBe('validation');
    const messages = Object.fromEntries(bad.body.error.details.map((d: { path: string; message: string }) => [d.path, d.message]));
    expect(messages).toMatchObject({
      lotSize: 'lot size must be at least 1',
      level: expect.stringMatching(/^inspection level must be one of S-1/),
      aql: expect.stringMatching(/^AQL must be one of 0.065/),
      severity: expect.stringMatching(/^severity must be one of normal, tightened, reduced/),
    });
    await clerk.get('/api/sampling/plan?lotSize=abc&level=II&aql=1&severity=normal').expect(400);
  });

  it('needs a sign-in', async () => {
    await request(app).get('/api/sampling/plan?lotSize=400&level=II&aql=1&severity=normal').expect(401);
  });
});
