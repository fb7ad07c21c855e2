// The dashboard per role. Which role sees which section, and that a section needs every permission
// its content reads, is Phaselot's own rule (shared/policies.ts, issue 14); each count is checked
// against the same count taken straight from the tables, and lists run oldest (or most urgent) first,
// which is common practice for work queues.
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { app, as, freshUser } from '../../../tests/helpers/api';
import { benchFile, sampleOf, signDecision, uploadBench } from '../../../tests/helpers/bench';
import { receivedLot } from '../../../tests/helpers/receivedLot';
import { can, POLICIES } from '../../../shared/policies';
import type { DashboardView } from '../../../shared/schemas/dashboard';
import { ROLES, type Role } from '../../../shared/schemas/roles';
import * as sections from '../../dashboard/sections';

const dashboardOf = async (role: Role) => (await (await as(role)).get('/api/dashboard').expect(200)).body as DashboardView;

const count = async (sql: string, replacements: Record<string, unknown> = {}) =>
  Number((await sequelize.query<{ n: string }>(sql, { type: QueryTypes.SELECT, replacements }))[0].n);

const sorted = <T>(values: T[]) => [...values].sort();

describe('GET /api/dashboard', () => {
  it('answers each demo role its own section and no other', async () => {
    const expected: Record<Role, string[]> = {
      admin: [],
      clerk: ['receiving'],
      inspector: ['inspection'],
      quality: ['quality'],
      buyer: ['purchasing'],
      auditor: ['audit'],
    };
    for (const role of ROLES) expect(Object.keys(await dashboardOf(role)), role).toEqual(expected[role]);
    await request(app).get('/api/dashboard').expect(401);
  });

  it('shows a user with several roles each of their sections', async () => {
    const user = await freshUser(['clerk', 'buyer', 'auditor']);
    const login = await request(app).post('/api/auth/login').send({ email: user.email, password: user.password }).expect(200);
    const view = (await request(app).get('/api/dashboard').set('Authorization', `Bearer ${login.body.token}`).expect(200)).body as DashboardView;
    expect(sorted(Object.keys(view))).toEqual(['audit', 'purchasing', 'receiving']);
  });

  it('gives a section only to roles that may read everything in it', () => {
    for (const section of Object.values(sections)) {
      for (const role of POLICIES[section.permission]) {
        for (const read of section.reads) expect(can({ roles: [role] }, read), `${section.permission}: ${role} reads ${read}`).toBe(true);
      }
    }
  });

  it("counts the inspector's lots to measure and their ages, oldest first", async () => {
    const before = (await dashboardOf('inspector')).inspection!;
    const lot = await receivedLot({ quantity: 8 });
    const { inspection } = await dashboardOf('inspector');
    const open = "SELECT count(*) AS n FROM lots WHERE state IN ('quarantine', 'inspection', 'sorting')";
    expect(inspection!.toMeasure.total).toBe(await count(open));
    expect(inspection!.toMeasure.total).toBeGreaterThanOrEqual(before.toMeasure.total + 1);
    expect(inspection!.ages.reduce((sum, bar) => sum + bar.value, 0)).toBe(inspection!.toMeasure.total);
    const received = inspection!.toMeasure.rows.map((r) => r.receivedOn);
    expect(received).toEqual(sorted(received));
    // The helper's shipment arrived three days ago: the lot is in the 3–6 days bucket.
    const [{ n: inBucket }] = await sequelize.query<{ n: string }>(
      "SELECT count(*) AS n FROM lots WHERE state IN ('quarantine', 'inspection', 'sorting') AND current_date - received_at::date BETWEEN 3 AND 6",
      { type: QueryTypes.SELECT },
    );
    expect(inspection!.ages.find((b) => b.label === '3–6 days')!.value).toBe(Number(inBucket));
    expect(lot.lotId).toBeGreaterThan(0);
  });

  it('shows quality the lots awaiting signature and the open NCRs, the buyer the rejection, with counts from the tables', async () => {
    const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, sample.slice(0, 3)));
    const waiting = (await dashboardOf('quality')).quality!;
    expect(waiting.awaitingSignature.total).toBe(await count("SELECT count(*) AS n FROM lots WHERE state = 'awaiting-disposition'"));
    expect(waiting.awaitingSignature.rows.length).toBeLessThanOrEqual(6);

    await signDecision(lot.lotId, 'reject', null);
    const { quality } = await dashboardOf('quality');
    expect(quality!.openNcrs.total).toBe(await count("SELECT count(*) AS n FROM nonconformances WHERE status <> 'closed'"));
    expect(quality!.ncrAges.reduce((sum, bar) => sum + bar.value, 0)).toBe(quality!.openNcrs.total);
    const opened = quality!.openNcrs.rows.map((r) => r.openedOn);
    expect(opened).toEqual(sorted(opened));
    expect(quality!.calibrations.total).toBe(await count('SELECT count(*) AS n FROM instruments WHERE active AND calibration_due_on <= current_date + 30'));

    const { purchasing } = await dashboardOf('buyer');
    // Just signed, so the newest rejection: first in the list, and on this buyer's PO.
    expect(purchasing!.rejected.rows[0]).toMatchObject({ lotId: lot.lotId, decision: 'reject', purchaseOrder: lot.poNumber, yours: true });
    expect(purchasing!.rejected.total).toBe(
      await count(
        "SELECT count(*) AS n FROM dispositions WHERE superseded_at IS NULL AND decision IN ('reject', 'sort') AND signed_at >= now() - interval '90 days'",
      ),
    );
    expect(purchasing!.openCorrective.total).toBe(await count("SELECT count(*) AS n FROM corrective_actions WHERE status <> 'closed'"));
  });

  it("lists the clerk's PO lines due, late ones first with their days late", async () => {
    const lot = await receivedLot({ quantity: 5 });
    // A second line of the lot's PO, owed entirely and due long ago: it sorts first.
    await sequelize.query(
      `INSERT INTO purchase_order_lines (purchase_order_id, line_number, part_id, quantity, unit_price, inspection_level, aql, spec, due_on)
       SELECT pl.purchase_order_id, 2, pl.part_id, 7, 10, 'II', 1, pl.spec, DATE '2001-01-01' FROM lots l JOIN purchase_order_lines pl ON pl.id = l.po_line_id WHERE l.id = :lotId`,
      { replacements: { lotId: lot.lotId } },
    );
    const { receiving } = await dashboardOf('clerk');
    const first = receiving!.due.rows[0];
    expect(first.dueOn <= receiving!.due.rows[receiving!.due.rows.length - 1].dueOn).toBe(true);
    const late = receiving!.due.rows.find((r) => r.purchaseOrder === lot.poNumber);
    expect(late).toMatchObject({ line: 2, outstanding: 7, dueOn: '2001-01-01' });
    // Days between two calendar dates, counted in UTC.
    expect(late!.daysLate).toBe(Math.round((Date.parse(new Date().toISOString().slice(0, 10)) - Date.parse('2001-01-01')) / 86_400_000));
    expect(receiving!.due.late).toBeGreaterThanOrEqual(1);
    expect(receiving!.awaited.pieces).toBeGreaterThanOrEqual(7);
  });

  it('shows the auditor the newest documents and the state of the audit chain', async () => {
    const { audit } = await dashboardOf('auditor');
    const issued = audit!.documents.rows.map((d) => d.issuedAt);
    expect(issued).toEqual(sorted(issued).reverse());
    expect(audit!.perDay).toHaveLength(14);
    expect(audit!.chain.tailIntact).toBe(true);
    const [head] = await sequelize.query<{ seq: string }>('SELECT seq FROM audit_chain_head', { type: QueryTypes.SELECT });
    expect(Number(audit!.chain.length)).toBeLessThanOrEqual(Number(head.seq));
    expect(audit!.chain.tailChecked).toBeGreaterThan(0);
  });
});
