// The audit chain under concurrent writers: every row's predecessor is the row before it in chain
// order, whatever interleaving the transactions take, and verification stays exact.
import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { QueryTypes, Sequelize, type Transaction } from 'sequelize';
import { app, as } from '../../../tests/helpers/api';
import { demoLogin } from '../../../db/seeders/demo';
import { sequelize } from '../../../db';
import { config } from '../../config';
import { recordAudit, SYSTEM_ACTOR } from '../../audit/record';
import { verifyAuditChain } from '../../audit/verify';
import * as chainMigration from '../../../db/migrations/20261202-0600-audit-chain-order';

const TRANSACTIONS = 24;
const ROWS_PER_TRANSACTION = 4;
const SIGN_INS = 12;

/** One transaction writing several audit rows, as a commit of several bench files does. */
const multiRowTransaction = (n: number) =>
  sequelize.transaction(async (transaction) => {
    for (let row = 0; row < ROWS_PER_TRANSACTION; row++) {
      await recordAudit(SYSTEM_ACTOR, { action: 'test.chain-hammer', entityType: 'test', entityId: `${n}.${row}` }, transaction);
    }
  });

/** A transaction that writes audit rows and then rolls back: it must leave no hole in the chain. */
const rolledBackTransaction = (n: number) =>
  sequelize
    .transaction(async (transaction) => {
      await recordAudit(SYSTEM_ACTOR, { action: 'test.chain-rolled-back', entityType: 'test', entityId: String(n) }, transaction);
      throw new Error('rolled back on purpose');
    })
    .catch((error: Error) => expect(error.message).toBe('rolled back on purpose'));

describe('audit chain under concurrency', () => {
  it('stays linear and verifies after parallel multi-row transactions, rollbacks and sign-ins', async () => {
    const auditor = await as('auditor');
    const [{ before }] = await sequelize.query<{ before: string }>('SELECT count(*) AS before FROM audit_events', { type: QueryTypes.SELECT });
    const signIn = (role: 'clerk' | 'buyer') => request(app).post('/api/auth/login').send(demoLogin(role)).expect(200);
    await Promise.all([
      ...Array.from({ length: TRANSACTIONS }, (_, n) => multiRowTransaction(n)),
      ...Array.from({ length: 4 }, (_, n) => rolledBackTransaction(n)),
      ...Array.from({ length: SIGN_INS }, (_, n) => signIn(n % 2 ? 'clerk' : 'buyer')),
    ]);

    const [{ after }] = await sequelize.query<{ after: string }>('SELECT count(*) AS after FROM audit_events', { type: QueryTypes.SELECT });
    expect(Number(after) - Number(before)).toBe(TRANSACTIONS * ROWS_PER_TRANSACTION + SIGN_INS);
    expect(
      await sequelize.query('SELECT 1 FROM audit_events WHERE action = :action', {
        type: QueryTypes.SELECT,
        replacements: { action: 'test.chain-rolled-back' },
      }),
    ).toEqual([]);

    const report = await auditor.get('/api/audit/verify').expect(200);
    expect(report.body).toMatchObject({ intact: true, problems: [] });
    expect(report.body.checked).toBe(Number(after));
  });
});

// Tampering and re-running the migration need the database owner's rights (the application's role
// can neither alter the trail nor switch its triggers off).
const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

class RolledBack extends Error {}

/** Runs `work` in a transaction that is always rolled back, so tampering never outlives its test. */
async function inRolledBackTransaction<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  let result: T | undefined;
  await owner
    .transaction(async (transaction) => {
      result = await work(transaction);
      throw new RolledBack();
    })
    .catch((error) => {
      if (!(error instanceof RolledBack)) throw error;
    });
  return result as T;
}

const query = <T extends object>(transaction: Transaction, sql: string, replacements: Record<string, unknown> = {}) =>
  owner.query<T>(sql, { type: QueryTypes.SELECT, transaction, replacements });

/** Rewrites the trail behind its triggers, as only the database owner can, and reports what verification sees. */
const tamperAndVerify = (sql: string, replacements: Record<string, unknown> = {}) =>
  inRolledBackTransaction(async (transaction) => {
    await owner.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_rewrite', { transaction });
    await owner.query(sql, { transaction, replacements });
    return verifyAuditChain(transaction);
  });

async function lastRows(count: number) {
  return sequelize.query<{ id: string; seq: string }>('SELECT id, seq FROM audit_events ORDER BY seq DESC LIMIT :count', {
    type: QueryTypes.SELECT,
    replacements: { count },
  });
}

describe('audit chain tampering', () => {
  it('names a row removed from the middle, rows cut off the end, and two rows swapped', async () => {
    const [last, middle, earlier] = await lastRows(3);
    const removed = await tamperAndVerify('DELETE FROM audit_events WHERE id = :id', { id: middle.id });
    expect(removed.intact).toBe(false);
    expect(removed.problems).toEqual([{ id: last.id, seq: last.seq, problem: 'rows missing before it' }]);

    const cut = await tamperAndVerify('DELETE FROM audit_events WHERE id = :id', { id: last.id });
    expect(cut.problems).toEqual([{ id: null, seq: last.seq, problem: 'head does not name the last row' }]);

    const swapped = await tamperAndVerify(
      `UPDATE audit_events SET seq = -1 WHERE id = :a; UPDATE audit_events SET seq = :seqA WHERE id = :b; UPDATE audit_events SET seq = :seqB WHERE id = :a`,
      { a: middle.id, seqA: middle.seq, b: earlier.id, seqB: earlier.seq },
    );
    expect(swapped.problems.map((p) => p.problem)).toEqual(['link broken', 'link broken', 'link broken']);
    expect((await verifyAuditChain()).intact).toBe(true);
  });

  it('refuses to move the chain head except by inserting an event', async () => {
    await expect(sequelize.query("UPDATE audit_chain_head SET seq = 1, hash = repeat('0', 64)")).rejects.toThrow(
      /moved only by inserting audit events: UPDATE refused/,
    );
    await expect(sequelize.query('DELETE FROM audit_chain_head')).rejects.toThrow(/DELETE refused/);
    // The application's role may not truncate at all; the owner meets the trigger.
    await expect(sequelize.query('TRUNCATE audit_chain_head')).rejects.toThrow(/TRUNCATE refused|permission denied/);
    await expect(owner.query('TRUNCATE audit_chain_head')).rejects.toThrow(/TRUNCATE refused/);
    await expect(sequelize.query('INSERT INTO audit_chain_head (singleton, seq) VALUES (true, 0)')).rejects.toThrow(/INSERT refused/);
  });

  it('serves the head to auditors and quality managers, matching the last row', async () => {
    const head = await (await as('quality')).get('/api/audit/head').expect(200);
    const [last] = await sequelize.query<{ seq: string; hash: string }>('SELECT seq, hash FROM audit_events ORDER BY seq DESC LIMIT 1', {
      type: QueryTypes.SELECT,
    });
    expect(head.body).toMatchObject({ seq: last.seq, hash: last.hash });
    expect(new Date(head.body.occurredAt).getTime()).not.toBeNaN();
    await (await as('buyer')).get('/api/audit/head').expect(403);
  });

  it('checks an anchor taken earlier: a match, another hash, a position the trail does not have', async () => {
    const auditor = await as('auditor');
    const head = (await auditor.get('/api/audit/head').expect(200)).body;
    const anchor = (query: Record<string, string>) => auditor.get('/api/audit/anchor').query(query);
    expect((await anchor({ seq: head.seq, hash: head.hash.toUpperCase() }).expect(200)).body).toMatchObject({ seq: head.seq, matches: true });
    expect((await anchor({ seq: head.seq, hash: '0'.repeat(64) }).expect(200)).body).toMatchObject({
      matches: false,
      message: expect.stringMatching(/carries another hash/),
    });
    expect((await anchor({ seq: '999999999', hash: head.hash }).expect(200)).body).toMatchObject({
      matches: false,
      message: expect.stringMatching(/no event at position 999999999/),
    });
    expect((await anchor({ seq: '1', hash: 'abc' }).expect(400)).body.error.details).toEqual([
      { path: 'hash', message: expect.stringMatching(/64-character SHA-256/) },
    ]);
  });
});

describe('the migration to chain positions', () => {
  /** Puts the schema back as it was, starts a trail of a few rows under the old trigger, lets
   * `legacyWrites` add to it, then migrates again; all of it rolled back afterwards. */
  const migrateFromLegacy = (legacyWrites: (transaction: Transaction) => Promise<void>) =>
    inRolledBackTransaction(async (transaction) => {
      await owner.query(chainMigration.DOWN, { transaction });
      await owner.query(
        'ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_rewrite; DELETE FROM audit_events; ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_rewrite',
        { transaction },
      );
      for (const n of [1, 2, 3]) await recordAudit(SYSTEM_ACTOR, { action: 'test.legacy', entityType: 'test', entityId: `before ${n}` }, transaction);
      await legacyWrites(transaction);
      const before = await query<{ id: string; hash: string }>(transaction, 'SELECT id, hash FROM audit_events ORDER BY id');
      await owner.query(chainMigration.UP, { transaction });
      const after = await query<{ id: string; seq: string; hash: string; action: string; before: unknown; after: unknown }>(
        transaction,
        'SELECT id, seq, hash, action, before, after FROM audit_events ORDER BY seq',
      );
      return { before, after, report: await verifyAuditChain(transaction) };
    });

  const legacyInsert = (transaction: Transaction, id: string, entityId: string) =>
    owner.query("INSERT INTO audit_events (id, action, entity_type, entity_id) VALUES (:id, 'test.legacy', 'test', :entityId)", {
      transaction,
      replacements: { id, entityId },
    });

  /** The old trigger linked a row to the highest id so far; an id drawn earlier but written later forks the chain. */
  const forkedWrites = async (transaction: Transaction) => {
    const [{ a, b }] = await query<{ a: string; b: string }>(transaction, "SELECT nextval('audit_events_id_seq') AS a, nextval('audit_events_id_seq') AS b");
    await legacyInsert(transaction, b, 'written first');
    await legacyInsert(transaction, a, 'written second');
    return { a, b };
  };

  it('keeps every digest of a trail that already links up in id order', async () => {
    const { before, after, report } = await migrateFromLegacy(async (transaction) => {
      await recordAudit(SYSTEM_ACTOR, { action: 'test.legacy', entityType: 'test', entityId: 'in order' }, transaction);
    });
    expect(report).toMatchObject({ intact: true, problems: [] });
    expect(after.map(({ id, hash }) => ({ id, hash }))).toEqual(before);
    expect(after.map((row) => Number(row.seq))).toEqual(before.map((_, i) => i + 1));
  });

  it('re-links a forked trail in id order and records the former digests in one event', async () => {
    let ids = { a: '', b: '' };
    const { before, after, report } = await migrateFromLegacy(async (transaction) => {
      ids = await forkedWrites(transaction);
    });
    expect(report).toMatchObject({ intact: true, problems: [] });
    const rebased = after[after.length - 1];
    expect(rebased.action).toBe('audit.chain-rebased');
    const legacyOf = new Map(before.map((row) => [row.id, row.hash]));
    const relinked = (rebased.before as { relinked: [number, string | null, string][] }).relinked;
    // The fork starts at the id drawn first but written second; everything from there is re-linked.
    expect(relinked.map(([id]) => String(id))).toEqual([ids.a, ids.b]);
    for (const [id, , hash] of relinked) expect(hash).toBe(legacyOf.get(String(id)));
    expect(rebased.after).toMatchObject({ rows: 2 });
    // Rows before the fork keep their digests.
    expect(after.slice(0, -3).map(({ id, hash }) => ({ id, hash }))).toEqual(before.filter((row) => BigInt(row.id) < BigInt(ids.a)));
  });

  it('never re-hashes a trail whose rows were altered: verification keeps naming them', async () => {
    const { after, report } = await migrateFromLegacy(async (transaction) => {
      const { b } = await forkedWrites(transaction);
      await owner.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_rewrite', { transaction });
      await owner.query("UPDATE audit_events SET entity_id = 'altered' WHERE id = :b", { transaction, replacements: { b } });
      await owner.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_rewrite', { transaction });
    });
    expect(after.some((row) => row.action === 'audit.chain-rebased')).toBe(false);
    expect(report.intact).toBe(false);
    expect(report.problems.map((p) => p.problem)).toContain('content changed');
  });
});
