// In-app notifications. Who is told of what follows Phaselot's own rules (the permission table in
// shared/policies.ts and issue 14): a rejected lot to the buyer of its PO, a lot whose sample decides
// it to quality, an NCR opened and a supplier's answer to the buyer and quality; nobody is told of,
// or counts, what their roles may not read. That a notice is written with its event or not at all is
// common practice for anything that reports an event (an event without its notice, or a notice of
// an event that never happened, misleads); a calibration coming due is told to quality with its mailed
// reminder, at the same thresholds.
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { inTransaction, sequelize } from '../../../db';
import { app, as, freshUser } from '../../../tests/helpers/api';
import { benchFile, sampleOf, signDecision, uploadBench } from '../../../tests/helpers/bench';
import { mailedToken, ncrOf, raiseRequest, supplierWithQualityContact } from '../../../tests/helpers/correctiveActions';
import { receivedLot } from '../../../tests/helpers/receivedLot';
import { remindCalibrationsDue } from '../../instruments/reminders';
import { notify } from '../../notifications/notify';
import type { NotificationsView } from '../../../shared/schemas/notifications';
import type { Role } from '../../../shared/schemas/roles';

type Written = { kind: string; user_id: number; roles: Role[]; permission: string; link: string };

/** The notifications written about one record, with their recipients' roles. */
const writtenAbout = (entityType: string, entityId: number) =>
  sequelize.query<Written>(
    `SELECT n.kind, n.user_id, u.roles, n.permission, n.link FROM notifications n JOIN users u ON u.id = n.user_id
      WHERE n.entity_type = :entityType AND n.entity_id = :entityId ORDER BY n.id`,
    { type: QueryTypes.SELECT, replacements: { entityType, entityId } },
  );

async function signedIn(email: string, password: string) {
  const login = await request(app).post('/api/auth/login').send({ email, password }).expect(200);
  const auth = `Bearer ${login.body.token}`;
  return {
    list: async () => (await request(app).get('/api/notifications').set('Authorization', auth).expect(200)).body as NotificationsView,
    read: (id: number) => request(app).post(`/api/notifications/${id}/read`).set('Authorization', auth),
    readAll: () => request(app).post('/api/notifications/read-all').set('Authorization', auth),
  };
}

/** A lot of 20 whose sample fails: three plates 0.006 λ long against a ±0.003 λ tolerance. */
async function failingLot(buyerEmail: string) {
  const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1, buyerEmail });
  const { sample } = await sampleOf(lot.lotId);
  await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, sample.slice(0, 3)));
  return lot;
}

describe('notifications written with their events', () => {
  it('tells quality that a lot awaits its decision, and the buyer of its PO that it was rejected, once signed', async () => {
    const buyer = await freshUser(['buyer']);
    const lot = await failingLot(buyer.email);

    const awaiting = await writtenAbout('lot', lot.lotId);
    expect(awaiting.length).toBeGreaterThan(0);
    expect(awaiting.every((n) => n.kind === 'awaiting-signature' && n.roles.includes('quality') && n.link === `/inspection/lots/${lot.lotId}`)).toBe(true);

    // A refused signature (wrong password) writes nothing.
    await signDecision(lot.lotId, 'reject', null, { password: 'not-the-password' }, 401);
    expect(await writtenAbout('lot', lot.lotId)).toHaveLength(awaiting.length);
    // Nor does a decision refused inside the transaction (someone else decided meanwhile, as far as it knows).
    await signDecision(lot.lotId, 'reject', 999_999, {}, 409);
    expect(await writtenAbout('lot', lot.lotId)).toHaveLength(awaiting.length);

    await signDecision(lot.lotId, 'reject', null);
    const rejected = (await writtenAbout('lot', lot.lotId)).filter((n) => n.kind === 'lot-rejected');
    expect(rejected.map((n) => n.user_id)).toEqual([buyer.user.id]);
    expect(rejected[0].link).toBe(`/lots/${lot.lotId}`);

    // The rejection opened an NCR: its buyer and quality are told, the quality manager who signed is not.
    const [ncr] = await sequelize.query<{ id: number; number: string }>('SELECT id, number FROM nonconformances WHERE lot_id = :lotId', {
      type: QueryTypes.SELECT,
      replacements: { lotId: lot.lotId },
    });
    const opened = await writtenAbout('nonconformance', ncr.id);
    expect(opened.every((n) => n.kind === 'ncr-opened' && (n.roles.includes('quality') || n.user_id === buyer.user.id))).toBe(true);
    expect(opened.map((n) => n.user_id)).toContain(buyer.user.id);
    const [signer] = await sequelize.query<{ id: number }>("SELECT id FROM users WHERE email = 'quality@phaselot.test'", { type: QueryTypes.SELECT });
    expect(opened.map((n) => n.user_id)).not.toContain(signer.id);

    // What the buyer's bell shows: the rejection and the NCR, both unread, newest first.
    const bell = await (await signedIn(buyer.email, buyer.password)).list();
    expect(bell.unread).toBe(2);
    expect(bell.data.map((n) => n.kind)).toEqual(['lot-rejected', 'ncr-opened']);
    expect(bell.data[0].title).toContain(`L-${lot.lotId} rejected`);
    expect(bell.data[1].title).toContain(ncr.number);
  });

  it("tells the requester and quality of a supplier's answer to a corrective-action request", async () => {
    const pair = await supplierWithQualityContact();
    const ncr = await ncrOf(pair);
    const car = await raiseRequest([ncr.id]);
    const { token } = await mailedToken(car.id);
    let answer = request(app).post('/api/corrective-actions/respond').set('X-Response-Link', token);
    for (const [name, value] of Object.entries({
      responderName: 'Orla Brennick',
      rootCause: 'Worn polishing pitch thinned the plates.',
      containment: 'Stock sorted 100 %.',
      correctiveActions: 'Pitch replaced on a fixed service life.',
      preventiveActions: 'Every plate measured before packing.',
      correctiveDueOn: '2026-12-20',
    }))
      answer = answer.field(name, value);
    await answer.expect(201);
    const told = await writtenAbout('corrective-action', car.id);
    expect(told.length).toBeGreaterThan(0);
    expect(told.every((n) => n.kind === 'corrective-answered' && n.permission === 'corrective.read')).toBe(true);
    expect(told.some((n) => n.roles.includes('quality'))).toBe(true);
    expect(told.some((n) => n.roles.includes('buyer'))).toBe(true);
    expect(told.some((n) => n.roles.every((r) => !['buyer', 'quality', 'auditor'].includes(r)))).toBe(false);
  });

  it('tells quality of a calibration coming due when its reminder goes out, once', async () => {
    const dueOn = new Date(Date.now() + 6 * 86_400_000).toISOString().slice(0, 10);
    const created = await (
      await as('quality')
    )
      .post('/api/instruments')
      .send({
        code: `T-NOTE-${Math.floor(Math.random() * 1e9)}`,
        kind: 'direct-retardance',
        uncertaintyWaves: 0.001,
        uncertaintyDeg: 0.1,
        calibratedOn: new Date(Date.now() - 300 * 86_400_000).toISOString().slice(0, 10),
        calibrationDueOn: dueOn,
      })
      .expect(201);
    await remindCalibrationsDue();
    await remindCalibrationsDue();
    const told = await writtenAbout('instrument', created.body.id);
    expect(told.length).toBeGreaterThan(0);
    expect(told.every((n) => n.kind === 'calibration-due' && n.roles.includes('quality') && n.link === `/instruments/${created.body.id}`)).toBe(true);
    // One per quality manager: the second run found the reminder claimed and wrote nothing.
    expect(new Set(told.map((n) => n.user_id)).size).toBe(told.length);
  });

  it('leaves nothing behind when the transaction of the event rolls back', async () => {
    const quality = await freshUser(['quality']);
    const marker = Math.floor(Math.random() * 1_000_000_000);
    await expect(
      inTransaction(async (transaction) => {
        const written = await notify(
          {
            kind: 'calibration-due',
            permission: 'instruments.read',
            title: 'test',
            link: '/instruments',
            entity: { type: 'instrument', id: marker },
            users: [quality.user.id],
          },
          transaction,
        );
        expect(written).toBe(1);
        throw new Error('the event failed');
      }),
    ).rejects.toThrow('the event failed');
    expect(await writtenAbout('instrument', marker)).toEqual([]);
  });
});

describe('what each user may see', () => {
  it('writes nothing for users whose roles may not read the subject, even when named', async () => {
    const clerk = await freshUser(['clerk']);
    const marker = Math.floor(Math.random() * 1_000_000_000);
    const written = await inTransaction((transaction) =>
      notify(
        // Clerks may not sign dispositions (shared/policies.ts): neither by name nor by role are they told.
        {
          kind: 'awaiting-signature',
          permission: 'disposition.sign',
          title: 'test',
          link: '/lots',
          entity: { type: 'lot', id: marker },
          users: [clerk.user.id],
          roles: ['clerk'],
        },
        transaction,
      ),
    );
    expect(written).toBe(0);
  });

  it('hides and does not count what a role change took away, and marks one or all read', async () => {
    const user = await freshUser(['quality', 'buyer']);
    const marker = Math.floor(Math.random() * 1_000_000_000);
    await inTransaction(async (transaction) => {
      for (const [kind, permission] of [
        ['awaiting-signature', 'disposition.sign'],
        ['corrective-answered', 'corrective.read'],
        ['lot-rejected', 'lots.read'],
      ] as const)
        await notify({ kind, permission, title: `${kind} ${marker}`, link: '/lots', entity: { type: 'test', id: marker }, users: [user.user.id] }, transaction);
    });
    const session = await signedIn(user.email, user.password);
    expect((await session.list()).unread).toBe(3);

    // A buyer alone may not sign: the signature notice leaves the list and the count.
    await sequelize.query("UPDATE users SET roles = ARRAY['buyer']::varchar(20)[] WHERE id = :id", { replacements: { id: user.user.id } });
    const asBuyer = await session.list();
    expect(asBuyer.unread).toBe(2);
    expect(asBuyer.data.map((n) => n.kind).sort()).toEqual(['corrective-answered', 'lot-rejected']);
    const hidden = await sequelize.query<{ id: number }>("SELECT id FROM notifications WHERE user_id = :id AND kind = 'awaiting-signature'", {
      type: QueryTypes.SELECT,
      replacements: { id: user.user.id },
    });
    await session.read(hidden[0].id).expect(404);

    await session.read(asBuyer.data[0].id).expect(204);
    const afterOne = await session.list();
    expect(afterOne.unread).toBe(1);
    expect(afterOne.data.find((n) => n.id === asBuyer.data[0].id)?.read).toBe(true);

    // Someone else's notification is not theirs to mark.
    const other = await freshUser(['buyer']);
    await (await signedIn(other.email, other.password)).read(asBuyer.data[1].id).expect(404);

    expect((await session.readAll().expect(200)).body).toEqual({ marked: 1 });
    expect((await session.list()).unread).toBe(0);
    // The hidden one stays unread: marking all read covers what the user can see.
    const [still] = await sequelize.query<{ read_at: Date | null }>('SELECT read_at FROM notifications WHERE id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: hidden[0].id },
    });
    expect(still.read_at).toBeNull();
  });

  it('answers each demo role its own list, and nothing without sign-in', async () => {
    await request(app).get('/api/notifications').expect(401);
    for (const role of ['clerk', 'auditor'] as const) {
      const list = (await (await as(role)).get('/api/notifications').expect(200)).body as NotificationsView;
      // Neither role reads signatures or corrective actions' answers to review: none reach them.
      expect(list.data.filter((n) => n.kind === 'awaiting-signature')).toEqual([]);
      if (role === 'clerk') expect(list.data.filter((n) => n.kind === 'corrective-answered')).toEqual([]);
    }
  });
});
