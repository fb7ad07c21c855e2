import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { QueryTypes, Sequelize } from 'sequelize';
import { parse } from 'csv-parse/sync';
import { app, as, freshUser } from '../../../tests/helpers/api';
import { sequelize } from '../../../db';
import { config } from '../../config';

// The database owner, who alone could switch the triggers off; the application's role cannot.
const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

async function lastEvent(action: string) {
  const [row] = await sequelize.query<{ id: string; after: unknown }>('SELECT id, after FROM audit_events WHERE action = :action ORDER BY id DESC LIMIT 1', {
    type: QueryTypes.SELECT,
    replacements: { action },
  });
  return row;
}

describe('audit trail', () => {
  it('offers its filters as lists: the record types on the trail and every user by name', async () => {
    const { email } = await freshUser(['buyer']);
    const choices = await (await as('auditor')).get('/api/audit/choices').expect(200);
    // The demo users sign in for every test, so sign-ins are on the trail.
    expect(choices.body.recordTypes).toContain('session');
    expect([...choices.body.recordTypes].sort()).toEqual(choices.body.recordTypes);
    expect(new Set(choices.body.recordTypes).size).toBe(choices.body.recordTypes.length);
    const [{ types }] = await sequelize.query<{ types: string[] }>('SELECT array_agg(DISTINCT entity_type ORDER BY entity_type) AS types FROM audit_events', {
      type: QueryTypes.SELECT,
    });
    expect(choices.body.recordTypes).toEqual(types);
    expect(choices.body.actors).toContainEqual({ email, name: expect.any(String) });
    await (await as('buyer')).get('/api/audit/choices').expect(403);
  });

  it('records sign-ins, refused sign-ins and user changes with actor, request id and address', async () => {
    const { email, password } = await freshUser(['buyer']);
    await request(app).post('/api/auth/login').set('x-request-id', 'req-audit-1').send({ email, password }).expect(200);
    await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' }).expect(401);
    const admin = await as('admin');
    const trail = await admin.get('/api/audit').query({ actor: email }).expect(200);
    const actions = trail.body.data.map((e: { action: string }) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['auth.sign-in', 'auth.sign-in-refused']));
    const signIn = trail.body.data.find((e: { action: string }) => e.action === 'auth.sign-in');
    expect(signIn).toMatchObject({ requestId: 'req-audit-1', actorRoles: ['buyer'], entityType: 'session' });
    expect(signIn.address).toMatch(/127\.0\.0\.1/);
    expect(signIn.hash).toMatch(/^[0-9a-f]{64}$/);

    // The first page counts; a later one reads one row past its end instead.
    expect(trail.body).toMatchObject({ total: trail.body.data.length, totalExact: true, totals: {} });
    const events = trail.body.total as number;
    const first = await admin.get('/api/audit').query({ actor: email, pageSize: 1, count: false }).expect(200);
    expect(first.body).toMatchObject({ total: 2, totalExact: false, data: [trail.body.data[0]] });
    expect(first.body).not.toHaveProperty('totals');
    const last = await admin.get('/api/audit').query({ actor: email, pageSize: 1, page: events }).expect(200);
    expect(last.body).toMatchObject({ total: events, totalExact: true, data: [trail.body.data[events - 1]] });
  });

  it('refuses UPDATE, DELETE and TRUNCATE at the database level', async () => {
    const { id } = await lastEvent('auth.sign-in');
    // The application's role is refused by its grants or, failing those, by the triggers; the owner by the triggers.
    for (const [who, refusal] of [
      [sequelize, /append-only|permission denied/],
      [owner, /append-only/],
    ] as const) {
      await expect(who.query(`UPDATE audit_events SET action = 'x' WHERE id = ${id}`)).rejects.toThrow(refusal);
      await expect(who.query(`DELETE FROM audit_events WHERE id = ${id}`)).rejects.toThrow(refusal);
      await expect(who.query('TRUNCATE audit_events')).rejects.toThrow(refusal);
    }
  });

  it('verifies the chain, and detects a row rewritten behind the trigger', async () => {
    const auditor = await as('auditor');
    const intact = await auditor.get('/api/audit/verify').expect(200);
    expect(intact.body).toMatchObject({ intact: true, problems: [] });
    expect(intact.body.checked).toBeGreaterThan(0);

    // The database owner can switch the trigger off; the chain still tells.
    const { id, after } = await lastEvent('auth.sign-in');
    const rewrite = async (value: unknown) =>
      owner.transaction(async (transaction) => {
        await owner.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_rewrite', { transaction });
        await owner.query('UPDATE audit_events SET after = :after::jsonb WHERE id = :id', {
          transaction,
          replacements: { id, after: value === null ? null : JSON.stringify(value) },
        });
        await owner.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_rewrite', { transaction });
      });
    await rewrite({ forged: true });
    const tampered = await auditor.get('/api/audit/verify').expect(200);
    expect(tampered.body.intact).toBe(false);
    expect(tampered.body.problems).toContainEqual(expect.objectContaining({ id, problem: 'content changed' }));
    await rewrite(after);
    expect((await auditor.get('/api/audit/verify').expect(200)).body.intact).toBe(true);
  });

  it('exports the filtered trail as CSV and records the export', async () => {
    const auditor = await as('auditor');
    const response = await auditor.get('/api/audit/export.csv').query({ action: 'auth.' }).expect(200);
    expect(response.headers['content-type']).toMatch(/text\/csv/);
    const rows = parse(response.text, { columns: true, bom: true }) as { action: string; hash: string }[];
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r) => r.action.startsWith('auth.'))).toBe(true);
    expect((await lastEvent('audit.export')).after).toEqual({ filter: expect.objectContaining({ action: 'auth.' }) });
  });

  it('is closed to roles without audit access', async () => {
    await (await as('clerk')).get('/api/audit').expect(403);
    await request(app).get('/api/audit/verify').expect(401);
  });
});
