// A kept answer is given again only while the database is as it was: any committed write, or a new
// minute, reads afresh; a failed read is never kept, and fails no other request.
import express from 'express';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { inTransaction, sequelize } from '../../db';
import { forgetUnchangedAnswers, sendUnchangedAnswer, unchangedAnswer } from './unchangedAnswers';

/** A read that counts its calls and answers the count. */
function countingRead(delayMs = 0) {
  const read = vi.fn(async () => {
    if (delayMs) await new Promise((done) => setTimeout(done, delayMs));
    return { reads: read.mock.calls.length };
  });
  return read;
}

const parsed = (answer: { body: Buffer }) => JSON.parse(answer.body.toString('utf8')) as unknown;

/** A committed transaction that writes, as any change in the product does (it takes a transaction id). */
const commitAWrite = () => inTransaction((transaction) => sequelize.query('SELECT txid_current()', { transaction }));

describe('answers kept while nothing changed', () => {
  beforeEach(() => forgetUnchangedAnswers());
  afterEach(() => vi.useRealTimers());

  it('gives a kept answer again, with the same bytes and entity tag, without reading', async () => {
    const read = countingRead();
    const first = await unchangedAnswer('list a', read);
    const second = await unchangedAnswer('list a', read);
    expect(read).toHaveBeenCalledTimes(1);
    expect(parsed(second)).toEqual({ reads: 1 });
    expect(second.body.equals(first.body)).toBe(true);
    expect(second.etag).toBe(first.etag);
  });

  it('keeps each key apart', async () => {
    const read = countingRead();
    await unchangedAnswer('list a', read);
    expect(parsed(await unchangedAnswer('list b', read))).toEqual({ reads: 2 });
  });

  it('reads afresh once a write has committed', async () => {
    const read = countingRead();
    await unchangedAnswer('list a', read);
    await commitAWrite();
    expect(parsed(await unchangedAnswer('list a', read))).toEqual({ reads: 2 });
  });

  it('reads afresh in a new minute, for lists that count days by the clock', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2026-12-02T10:15:30Z'));
    const read = countingRead();
    await unchangedAnswer('list a', read);
    vi.setSystemTime(new Date('2026-12-02T10:15:59Z'));
    expect(parsed(await unchangedAnswer('list a', read))).toEqual({ reads: 1 });
    vi.setSystemTime(new Date('2026-12-02T10:16:00Z'));
    expect(parsed(await unchangedAnswer('list a', read))).toEqual({ reads: 2 });
  });

  it("keys by the snapshot a request's sign-in check read, when it gives one", async () => {
    const snapshotNow = async () => (await sequelize.query<{ s: string }>('SELECT pg_current_snapshot()::text AS s', { type: QueryTypes.SELECT }))[0].s;
    const read = countingRead();
    const before = await snapshotNow();
    await unchangedAnswer('list a', read, before);
    expect(parsed(await unchangedAnswer('list a', read, before))).toEqual({ reads: 1 });
    await commitAWrite();
    const after = await snapshotNow();
    expect(after).not.toBe(before);
    expect(parsed(await unchangedAnswer('list a', read, after))).toEqual({ reads: 2 });
  });

  it('lets requests arriving together read each on its own, so that one whose read fails fails alone', async () => {
    const failing = vi.fn(async () => {
      await new Promise((done) => setTimeout(done, 50));
      throw new Error('statement cancelled');
    });
    const read = countingRead(20);
    const [first, second] = await Promise.allSettled([unchangedAnswer('list a', failing), unchangedAnswer('list a', read)]);
    expect(first.status).toBe('rejected');
    expect(second.status === 'fulfilled' && parsed(second.value)).toEqual({ reads: 1 });
    // The answer that was read is kept; the failed read left nothing behind.
    expect(parsed(await unchangedAnswer('list a', read))).toEqual({ reads: 1 });
    await expect(unchangedAnswer('list b', failing)).rejects.toThrow('statement cancelled');
    expect(parsed(await unchangedAnswer('list b', countingRead()))).toEqual({ reads: 1 });
  });

  it('answers a client holding the entity tag with 304 and no body', async () => {
    const app = express();
    app.get('/list', (req, res, next) => sendUnchangedAnswer(req, res, 'list http', async () => ({ rows: [1, 2, 3] })).catch(next));
    const first = await request(app)
      .get('/list')
      .expect(200)
      .expect('content-type', /application\/json/);
    expect(first.body).toEqual({ rows: [1, 2, 3] });
    const again = await request(app).get('/list').set('if-none-match', first.headers.etag).expect(304);
    expect(again.text).toBe('');
  });
});
