// Answers of read-only lists, kept while the database has not changed. Each request reads the
// database's current snapshot (pg_current_snapshot()): its text stays the same only while no
// transaction has committed or begun writing since, so a kept answer is exactly what reading the
// list again would give. The key holds the minute too, for lists that count days or mark what is
// overdue by the clock. Busy lists (the same page asked for by a room of people, or by a page that
// refreshes) then cost no statement of their own; the first request after a change reads afresh.
import etag from 'etag';
import type { Request, Response } from 'express';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';

/** Bytes of JSON kept at most per process, and per answer (a bigger one is not kept). */
const MAX_KEPT_BYTES = 16_000_000;
const MAX_ANSWER_BYTES = 2_000_000;

/** An answer as it is sent: its JSON's bytes and their entity tag, made once. */
export type Answer = { body: Buffer; etag: string };

type Kept = { state: string; answers: Map<string, Answer>; bytes: number };

let kept: Kept = { state: '', answers: new Map(), bytes: 0 };

/**
 * What an answer depends on besides its request: every committed write, and the clock's minute. The
 * snapshot is the one the request's sign-in check read, or read now.
 */
async function databaseState(snapshot?: string): Promise<string> {
  if (snapshot === undefined) {
    const [row] = await sequelize.query<{ snapshot: string }>('SELECT pg_current_snapshot()::text AS snapshot', { type: QueryTypes.SELECT });
    snapshot = row.snapshot;
  }
  return `${snapshot} ${new Date().toISOString().slice(0, 16)}`;
}

/**
 * The JSON of `read()`, or the same answer kept from an earlier request with the same `key` while
 * nothing has changed. `key` must name everything else the answer depends on (the list and its
 * parsed query); whoever may ask is checked before, so the answer must not depend on the user.
 * `snapshot`, when given, must have been read before `read()` runs (so that what it reads is at
 * least as new as what the key says).
 */
export async function unchangedAnswer(key: string, read: () => Promise<unknown>, snapshot?: string): Promise<Answer> {
  const state = await databaseState(snapshot);
  if (kept.state !== state) kept = { state, answers: new Map(), bytes: 0 };
  const store = kept;
  const found = store.answers.get(key);
  if (found) return found;
  // Each request that finds nothing kept reads on its own: a read shared with another request
  // would fail with it when that request's client leaves and its statements are cancelled.
  const body = Buffer.from(JSON.stringify(await read()));
  const answer = { body, etag: etag(body, { weak: true }) };
  if (body.length <= MAX_ANSWER_BYTES && store.bytes + body.length <= MAX_KEPT_BYTES && !store.answers.has(key)) {
    store.answers.set(key, answer);
    store.bytes += body.length;
  }
  return answer;
}

/** Sends `unchangedAnswer(key, read)`, with its entity tag (a client holding it gets 304). */
export async function sendUnchangedAnswer(req: Request, res: Response, key: string, read: () => Promise<unknown>) {
  const { body, etag } = await unchangedAnswer(key, read, req.databaseSnapshot);
  res.type('json').set('ETag', etag).send(body);
}

/** Forgets every kept answer (tests that compare a first read with a later one). */
export function forgetUnchangedAnswers() {
  kept = { state: '', answers: new Map(), bytes: 0 };
}
