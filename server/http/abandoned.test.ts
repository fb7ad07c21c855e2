// A read whose client leaves is stopped in PostgreSQL (its statement cancelled, no further statement
// started); a change runs to its end; every statement is bounded by the statement timeout.
import express from 'express';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { setTimeout as sleep } from 'node:timers/promises';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inTransaction, sequelize } from '../../db';
import { config } from '../config';
import { stopWhenAbandoned } from './abandoned';
import { errorHandler } from './errors';

const outcomes = new Map<string, string[]>();
const note = (tag: string, what: string) => outcomes.set(tag, [...(outcomes.get(tag) ?? []), what]);
const outcome = (error: unknown) => (error as { parent?: { code?: string } }).parent?.code ?? (error as { code?: string }).code ?? String(error);

/** A statement that would run for a minute, named by its tag so pg_stat_activity can find it. */
const slow = (tag: string) => `SELECT pg_sleep(60) /* ${tag} */`;

const app = express();
app.use(stopWhenAbandoned);
app.get('/read/:tag', async (req, res, next) => {
  const { tag } = req.params;
  try {
    await sequelize.query(slow(tag));
    res.json({ done: true });
  } catch (error) {
    note(tag, outcome(error));
    // The request goes on as code may after an error; its next statement is refused.
    await sequelize.query('SELECT 1').catch((again) => note(tag, outcome(again)));
    next(error);
  }
});
app.get('/read-in-transaction/:tag', async (req, res, next) => {
  const { tag } = req.params;
  try {
    await inTransaction((transaction) => sequelize.query(slow(tag), { transaction }));
    res.json({ done: true });
  } catch (error) {
    note(tag, outcome(error));
    next(error);
  }
});
app.post('/change/:tag', async (req, res) => {
  await sequelize.query(`SELECT pg_sleep(1) /* ${req.params.tag} */`);
  note(req.params.tag, 'completed');
  res.json({ done: true });
});
app.get('/too-long', async (_req, res, next) => {
  try {
    await inTransaction(async (transaction) => {
      await sequelize.query('SET LOCAL statement_timeout = 200', { transaction });
      await sequelize.query('SELECT pg_sleep(5)', { transaction });
    });
    res.json({ done: true });
  } catch (error) {
    next(error);
  }
});
app.use(errorHandler);

let server: http.Server;
let port: number;
beforeAll(async () => {
  server = await new Promise((done) => {
    const listening = app.listen(0, '127.0.0.1', () => done(listening));
  });
  port = (server.address() as AddressInfo).port;
});
afterAll(() => new Promise((done) => server.close(done)));

const running = async (tag: string) =>
  Number(
    (
      await sequelize.query<{ n: string }>(
        `SELECT count(*) AS n FROM pg_stat_activity WHERE state = 'active' AND query LIKE :pattern AND pid <> pg_backend_pid()`,
        {
          type: QueryTypes.SELECT,
          replacements: { pattern: `%/* ${tag} */%` },
        },
      )
    )[0].n,
  );

/** Polls until `check` holds, at most `tries` times a tenth of a second apart. */
async function eventually(check: () => Promise<boolean>, tries = 50) {
  for (let i = 0; i < tries; i++) {
    if (await check()) return true;
    await sleep(100);
  }
  return false;
}

/** Sends a request and leaves (closes the connection) once its statement runs in PostgreSQL. */
async function leaveWhileRunning(method: 'GET' | 'POST', path: string, tag: string) {
  const sent = http.request({ host: '127.0.0.1', port, method, path });
  sent.on('error', () => {});
  sent.end();
  expect(await eventually(async () => (await running(tag)) === 1)).toBe(true);
  sent.destroy();
}

describe('requests whose client leaves', () => {
  it('cancel a read’s running statement and refuse its next one', async () => {
    const tag = `abandoned-${randomUUID()}`;
    await leaveWhileRunning('GET', `/read/${tag}`, tag);
    // A minute-long statement, gone well before its minute.
    expect(await eventually(async () => (await running(tag)) === 0)).toBe(true);
    expect(await eventually(async () => (outcomes.get(tag) ?? []).length === 2)).toBe(true);
    // 57014: query_canceled (PostgreSQL error codes, appendix A).
    expect(outcomes.get(tag)).toEqual(['57014', 'abandoned']);
  });

  it('roll back a read’s transaction and leave its connection fit for the next request', async () => {
    const tag = `abandoned-${randomUUID()}`;
    await leaveWhileRunning('GET', `/read-in-transaction/${tag}`, tag);
    expect(await eventually(async () => (await running(tag)) === 0)).toBe(true);
    expect(await eventually(async () => outcomes.has(tag))).toBe(true);
    expect(outcomes.get(tag)).toEqual(['57014']);
    const [{ open }] = await sequelize.query<{ open: string }>(
      `SELECT count(*) AS open FROM pg_stat_activity WHERE state LIKE 'idle in transaction%' AND query LIKE :pattern`,
      { type: QueryTypes.SELECT, replacements: { pattern: `%/* ${tag} */%` } },
    );
    expect(Number(open)).toBe(0);
  });

  it('let a change run to its end', async () => {
    const tag = `change-${randomUUID()}`;
    await leaveWhileRunning('POST', `/change/${tag}`, tag);
    expect(await eventually(async () => outcomes.get(tag)?.[0] === 'completed')).toBe(true);
  });
});

describe('the statement timeout', () => {
  it('is set on the application’s connections and answers 503 when reached', async () => {
    const [{ statement_timeout }] = await sequelize.query<{ statement_timeout: string }>('SHOW statement_timeout', { type: QueryTypes.SELECT });
    expect(statement_timeout).toBe(config.STATEMENT_TIMEOUT_SECONDS ? `${config.STATEMENT_TIMEOUT_SECONDS}s` : '0');
    const refused = await request(app).get('/too-long').expect(503);
    expect(refused.body.error.code).toBe('timeout');
  });
});
