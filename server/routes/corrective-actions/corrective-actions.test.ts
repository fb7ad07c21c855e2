// Corrective-action requests and the supplier's answer through the mailed link. That a request to a
// supplier asks for root cause, containment, corrective and preventive actions with dates, that
// quality accepts or returns the answer and closes the request only once later lots show it
// worked, is common practice of supplier corrective action (8D-style); the link's rules (one
// request, 30 days, one answer, revocable, rate-limited, PDF/PNG/JPEG only) are Phaselot's own.
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { CorrectiveActionLink, OutboxMail } from '../../../db/models';
import { DEMO_PASSWORD } from '../../../db/seeders/demo';
import { app, as } from '../../../tests/helpers/api';
import { mailedToken, ncrOf, raiseRequest, supplierWithQualityContact } from '../../../tests/helpers/correctiveActions';
import { TINY_PDF } from '../../../tests/helpers/purchasing';
import { decide, supplierPart } from '../../../tests/helpers/switching';
import { config } from '../../config';
import { remindOverdueRequests } from '../../supplierquality/reminders';
import { tokenOf } from '../../supplierquality/responseLinks';

const TINY_PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64');
const ANSWER = {
  responderName: 'Ilse Varga',
  rootCause: 'The polishing pitch of line 2 was worn past its service life, so plates came out thin.',
  containment: 'Stock at our site sorted 100 %; long plates quarantined.',
  correctiveActions: 'Pitch replaced; service life set to 400 hours in the line procedure.',
  preventiveActions: 'Retardance of every plate measured before packing.',
  containmentOn: '2026-11-20',
  correctiveDueOn: '2026-12-15',
};

const open = (token: string) => request(app).get('/api/corrective-actions/respond').set('X-Response-Link', token);

function answer(token: string, files: [Buffer, string][] = [], fields: Record<string, string> = ANSWER) {
  let call = request(app).post('/api/corrective-actions/respond').set('X-Response-Link', token).set('User-Agent', 'supplier-browser/1.0');
  for (const [name, value] of Object.entries(fields)) call = call.field(name, value);
  for (const [content, name] of files) call = call.attach('files', content, name);
  return call;
}

const view = async (id: number) => (await (await as('auditor')).get(`/api/corrective-actions/${id}`).expect(200)).body;

async function requestWithLink() {
  const pair = await supplierWithQualityContact();
  const ncr = await ncrOf(pair);
  const car = await raiseRequest([ncr.id]);
  const { token, mail } = await mailedToken(car.id);
  return { pair, ncr, car, token, mail };
}

// Every call here comes from one address: the form's rate limit starts afresh for each test.
const clearRateLimits = () => sequelize.query('DELETE FROM rate_limit_hits');
beforeEach(clearRateLimits);
afterAll(clearRateLimits);

describe('/api/corrective-actions', () => {
  it("raises a request from NCRs of one supplier's part and mails its quality contact a link to answer", async () => {
    const pair = await supplierWithQualityContact();
    const [first, second] = [await ncrOf(pair), await ncrOf(pair, 'Fast-axis mark 1.2° off')];
    const car = await raiseRequest([first.id, second.id]);
    expect(car).toMatchObject({ number: expect.stringMatching(/^CAR-\d{4}-\d{4}$/), status: 'awaiting-response', ncrs: [first.number, second.number].sort() });

    const { mail, token } = await mailedToken(car.id);
    expect(mail.recipients).toEqual([pair.qualityContactEmail]);
    expect(mail.subject).toBe(`Corrective action requested: ${car.number}, T-${pair.tag} (Test supplier ${pair.tag})`);
    expect(mail.bodyText).toContain(`${first.number}: Retardance 0.006 λ long on two plates (serials ${first.serials.join(', ')})`);
    expect(mail.bodyText).toContain(`${config.PUBLIC_URL}/respond#token=`);

    // What the supplier sees: this request and nothing of the site's records beyond it.
    const seen = (await open(token).expect(200)).body;
    expect(seen).toMatchObject({ number: car.number, supplier: `Test supplier ${pair.tag}`, part: { number: `T-${pair.tag}` }, returnedNote: null });
    // In NCR-number order.
    expect(seen.ncrs.map((n: { number: string; serials: string[] }) => [n.number, n.serials])).toEqual(
      [first, second].sort((a, b) => a.number.localeCompare(b.number)).map((n) => [n.number, n.serials]),
    );
    expect(Object.keys(seen).sort()).toEqual(['linkExpiresAt', 'ncrs', 'number', 'part', 'problem', 'responseDueOn', 'returnedNote', 'supplier']);
    // Valid for 30 days.
    expect(Date.parse(seen.linkExpiresAt) - Date.now()).toBeGreaterThan(29.9 * 86_400_000);
    expect(Date.parse(seen.linkExpiresAt) - Date.now()).toBeLessThanOrEqual(30 * 86_400_000);

    // An NCR under an open request is not raised again; NCRs of two suppliers do not share one.
    const again = await (
      await as('buyer')
    )
      .post('/api/corrective-actions')
      .send({ nonconformanceIds: [first.id], problem: 'Same problem raised a second time by mistake', responseDueOn: seen.responseDueOn });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe(`Already under an open corrective-action request: ${first.number} (${car.number})`);
    const other = await supplierWithQualityContact();
    const mixed = await (await as('buyer')).post('/api/corrective-actions').send({
      nonconformanceIds: [(await ncrOf(other)).id, (await ncrOf(pair)).id],
      problem: 'Two suppliers in one request is refused',
      responseDueOn: seen.responseDueOn,
    });
    expect(mixed.status).toBe(400);
    expect(mixed.body.error.message).toMatch(/covers one supplier's part/);
  });

  it('refuses a supplier without a quality contact', async () => {
    const pair = await supplierPart();
    const ncr = await ncrOf(pair);
    const refused = await (await as('buyer')).post('/api/corrective-actions').send({
      nonconformanceIds: [ncr.id],
      problem: 'Retardance runs long on every lot',
      responseDueOn: new Date(Date.now() + 5 * 86_400_000).toISOString().slice(0, 10),
    });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toBe(`Test supplier ${pair.tag} has no quality contact: add the address on the supplier's page first`);
  });

  it('takes one answer through the link, with its files, tells buyer and quality, and audits it with its address', async () => {
    const { car, token } = await requestWithLink();
    const sent = await answer(token, [
      [TINY_PDF, 'report.pdf'],
      [TINY_PNG, 'pitch.png'],
    ]);
    expect(sent.status, JSON.stringify(sent.body)).toBe(201);

    const after = await view(car.id);
    expect(after.status).toBe('responded');
    expect(after.responseHistory).toHaveLength(1);
    expect(after.responseHistory[0]).toMatchObject({ ...ANSWER, review: null, address: expect.stringMatching(/127\.0\.0\.1|::1/) });
    expect(after.responseHistory[0].attachments.map((a: { name: string; mediaType: string }) => [a.name, a.mediaType])).toEqual([
      ['report.pdf', 'application/pdf'],
      ['pitch.png', 'image/png'],
    ]);
    const file = after.responseHistory[0].attachments[1];
    const download = await (await as('buyer')).get(`/api/corrective-actions/${car.id}/attachments/${file.id}`).buffer(true).expect(200);
    expect(download.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(download.body as Buffer, TINY_PNG)).toBe(0);

    const told = await OutboxMail.findOne({
      where: { relatedType: 'corrective-action', relatedId: String(car.id), subject: `Supplier answered ${car.number}: review the answer` },
    });
    expect(told!.recipients).toEqual(expect.arrayContaining(['buyer@phaselot.test', 'quality@phaselot.test']));
    expect(told!.bodyText).toContain(`Root cause: ${ANSWER.rootCause}`);

    const [audit] = await sequelize.query<{ address: string; after: { responderName: string; files: { sha256: string }[]; userAgent: string } }>(
      `SELECT address, after FROM audit_events WHERE action = 'corrective-action.response' AND entity_id = :id`,
      { type: QueryTypes.SELECT, replacements: { id: String(car.id) } },
    );
    expect(audit.address).toMatch(/127\.0\.0\.1|::1/);
    expect(audit.after).toMatchObject({ responderName: ANSWER.responderName, userAgent: 'supplier-browser/1.0' });
    expect(audit.after.files).toHaveLength(2);

    // A second submission through the same link is refused, and the refusal is audited too.
    const second = await answer(token);
    expect(second.status).toBe(410);
    expect(second.body.error.code).toBe('link_used');
    expect((await open(token).expect(410)).body.error.message).toMatch(
      /^An answer was already sent through this link on \d{4}-\d{2}-\d{2}\. A link takes one answer\.$/,
    );
    const [refusal] = await sequelize.query<{ address: string; after: { code: string } }>(
      `SELECT address, after FROM audit_events WHERE action = 'corrective-action.response-refused' AND entity_id = :id ORDER BY id DESC LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { id: String(car.id) } },
    );
    expect(refusal).toMatchObject({ address: expect.stringMatching(/127\.0\.0\.1|::1/), after: { code: 'link_used' } });
    expect((await view(car.id)).responseHistory).toHaveLength(1);
  });

  it('reaches only its own request: a forged or altered token and an expired or revoked link are refused', async () => {
    const first = await requestWithLink();
    const second = await requestWithLink();
    expect((await open(first.token).expect(200)).body.number).toBe(first.car.number);
    expect((await open(second.token).expect(200)).body.number).toBe(second.car.number);

    // The first link's token made to name the second request: its signature no longer holds.
    const [header, payload, signature] = first.token.split('.');
    const claims = JSON.parse(Buffer.from(payload, 'base64url').toString());
    const altered = `${header}.${Buffer.from(JSON.stringify({ ...claims, sub: String(second.car.id) })).toString('base64url')}.${signature}`;
    expect((await open(altered).expect(401)).body.error.code).toBe('link_invalid');
    // A token signed with another key, naming the second request's link.
    const forged = jwt.sign({ ...claims, sub: String(second.car.id), jti: claims.jti }, 'not-the-server-key-at-all');
    expect((await answer(forged).expect(401)).body.error.code).toBe('link_invalid');
    expect((await open('').expect(400)).body.error.code).toBe('link_missing');

    // Thirty days on, the link has expired (its times moved back, its token signed from them as issued).
    const link = await CorrectiveActionLink.findOne({ where: { correctiveActionId: first.car.id }, rejectOnEmpty: true });
    link.set({ issuedAt: new Date(Date.now() - 31 * 86_400_000), expiresAt: new Date(Date.now() - 86_400_000) });
    await link.save();
    const expired = tokenOf(link);
    expect((await open(expired).expect(410)).body.error).toMatchObject({
      code: 'link_expired',
      message: expect.stringMatching(/^This link expired on \d{4}-\d{2}-\d{2}\. Ask your contact for a new one\.$/),
    });
    expect((await answer(expired)).status).toBe(410);

    // The buyer revokes the second link: it answers nothing any more.
    const buyer = await as('buyer');
    await buyer.post(`/api/corrective-actions/${second.car.id}/link/revocation`).expect(200);
    expect((await open(second.token).expect(410)).body.error.code).toBe('link_revoked');
    expect((await answer(second.token)).status).toBe(410);
    expect((await view(second.car.id)).links).toEqual([expect.objectContaining({ live: false, revokedAt: expect.any(String) })]);
    await buyer.post(`/api/corrective-actions/${second.car.id}/link/revocation`).expect(409);

    // A new link works where the revoked one did not.
    await buyer.post(`/api/corrective-actions/${second.car.id}/link`).expect(201);
    const fresh = await mailedToken(second.car.id);
    expect(fresh.mail.subject).toMatch(/^Corrective action requested/);
    expect(fresh.token).not.toBe(second.token);
    expect((await answer(fresh.token)).status).toBe(201);
  });

  it('refuses an attachment whose content is not a PDF, PNG or JPEG, and keeps the link for a corrected answer', async () => {
    const { car, token } = await requestWithLink();
    const disguised = await answer(token, [[Buffer.from('<html><script>alert(1)</script></html>'), 'report.pdf']]);
    expect(disguised.status).toBe(415);
    expect(disguised.body.error.message).toBe('report.pdf is not a PDF, PNG or JPEG');
    const zip = await answer(token, [[Buffer.from('504b0304140000000800', 'hex'), 'photos.jpg']]);
    expect(zip.status).toBe(415);
    const [{ n }] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM corrective_action_responses WHERE corrective_action_id = :id`, {
      type: QueryTypes.SELECT,
      replacements: { id: car.id },
    });
    expect(n).toBe(0);
    const missing = await answer(token, [], { ...ANSWER, rootCause: '' });
    expect(missing.status).toBe(400);
    expect(missing.body.error.details.map((d: { path: string }) => d.path)).toEqual(['rootCause']);
    expect((await answer(token, [[TINY_PDF, 'report.pdf']])).status).toBe(201);
  });

  it('refuses a file over 10 MB before storing anything, audits the refusal with its address, and keeps the link', async () => {
    const { car, token } = await requestWithLink();
    // A PDF (its header sniffed as one) one byte over the 10 MB limit, beside an acceptable file.
    const oversized = Buffer.concat([TINY_PDF, Buffer.alloc(10 * 1024 * 1024 + 1 - TINY_PDF.length, 0x20)]);
    const refused = await answer(token, [
      [TINY_PDF, 'summary.pdf'],
      [oversized, 'scan.pdf'],
    ]);
    expect(refused.status).toBe(413);
    expect(refused.body.error).toMatchObject({ code: 'file_too_large', message: 'A file is larger than 10 MB; attach files of up to 10 MB each' });
    const [refusal] = await sequelize.query<{ address: string; after: { code: string; userAgent: string } }>(
      `SELECT address, after FROM audit_events WHERE action = 'corrective-action.response-refused' AND entity_id = :id ORDER BY id DESC LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { id: String(car.id) } },
    );
    expect(refusal).toMatchObject({ address: expect.stringMatching(/127\.0\.0\.1|::1/), after: { code: 'file_too_large', userAgent: 'supplier-browser/1.0' } });
    expect((await view(car.id)).responseHistory).toEqual([]);
    // Exactly 10 MB is within the limit.
    const largest = oversized.subarray(0, 10 * 1024 * 1024);
    expect((await answer(token, [[largest, 'scan.pdf']])).status).toBe(201);
    expect((await view(car.id)).responseHistory[0].attachments).toEqual([expect.objectContaining({ name: 'scan.pdf', size: 10 * 1024 * 1024 })]);
  });

  it('returns an answer with a note and a new link, accepts the next one (signed) and closes on later lots that were checked', async () => {
    const { pair, car, token } = await requestWithLink();
    await answer(token).expect(201);
    const quality = await as('quality');
    await (
      await as('buyer')
    )
      .post(`/api/corrective-actions/${car.id}/review`)
      .send({ decision: 'return', note: 'Say how the pitch wear is now tracked.' })
      .expect(403);
    const returned = await quality
      .post(`/api/corrective-actions/${car.id}/review`)
      .send({ decision: 'return', note: 'Say how the pitch wear is now tracked.' })
      .expect(200);
    expect(returned.body.status).toBe('awaiting-response');
    const next = await mailedToken(car.id);
    expect(next.mail.subject).toBe(`Answer returned: ${car.number}, T-${pair.tag} (Test supplier ${pair.tag})`);
    expect(next.mail.bodyText).toContain('Note from quality: Say how the pitch wear is now tracked.');
    expect((await open(next.token).expect(200)).body.returnedNote).toBe('Say how the pitch wear is now tracked.');
    await answer(next.token, [], { ...ANSWER, preventiveActions: 'Pitch hours logged per shift; replaced at 400 hours.' }).expect(201);

    const sign = { decision: 'accept', note: 'Root cause and actions convincing.', password: DEMO_PASSWORD, meaningAcknowledged: true };
    expect((await quality.post(`/api/corrective-actions/${car.id}/review`).send({ ...sign, password: 'wrong-password' })).body.error.code).toBe(
      'signature_refused',
    );
    const accepted = await quality.post(`/api/corrective-actions/${car.id}/review`).send(sign).expect(200);
    expect(accepted.body).toMatchObject({ status: 'accepted', acceptedBy: expect.any(String) });
    expect(accepted.body.responseHistory.map((r: { review: string }) => r.review)).toEqual(['accepted', 'returned']);

    // Closing names later lots of the part that were decided; an earlier lot (the NCR's) cannot count.
    const { lotId: later } = await pair.receive(20);
    await decide(later, 'accept');
    const close = { note: 'Next lot measured in full: all plates within ±0.003 λ.', password: DEMO_PASSWORD, meaningAcknowledged: true };
    const refused = await quality
      .post(`/api/corrective-actions/${car.id}/closure`)
      .send({ ...close, lotIds: [accepted.body.nonconformances[0].lotId] })
      .expect(400);
    expect(refused.body.error.message).toMatch(
      /^Only decided lots of this supplier's part received after the answer was accepted show whether it worked: L-\d+ is not one$/,
    );
    const closed = await quality
      .post(`/api/corrective-actions/${car.id}/closure`)
      .send({ ...close, lotIds: [later] })
      .expect(200);
    expect(closed.body).toMatchObject({ status: 'closed', effectivenessNote: close.note, checkedLots: [{ id: later, decision: 'accept' }] });
  });

  it('reminds an overdue request once a week: the supplier with its link, the requester with a copy', async () => {
    const { car, pair } = await requestWithLink();
    // The due date passes.
    await sequelize.query(`UPDATE corrective_actions SET response_due_on = (now() AT TIME ZONE 'UTC')::date - 3 WHERE id = :id`, {
      replacements: { id: car.id },
    });
    expect(
      (await (await as('buyer')).get(`/api/corrective-actions?overdue=true&supplierId=${pair.supplierId}`).expect(200)).body.data.map(
        (c: { number: string }) => c.number,
      ),
    ).toEqual([car.number]);

    const reminded = await remindOverdueRequests();
    expect(reminded).toContain(car.number);
    const mails = await OutboxMail.findAll({ where: { relatedType: 'corrective-action', relatedId: String(car.id) }, order: [['id', 'ASC']] });
    const toSupplier = mails.find((m) => m.subject === `Reminder: your answer to ${car.number} is overdue`)!;
    expect(toSupplier.recipients).toEqual([pair.qualityContactEmail]);
    expect(toSupplier.bodyText).toContain('3 days past its due date');
    const copy = mails.find((m) => m.subject === `${car.number} is overdue: the supplier was reminded`)!;
    expect(copy.recipients).toEqual(['buyer@phaselot.test']);
    // The reminder's link is the live one: the supplier can still answer with it.
    const token = toSupplier.bodyText.match(/\/respond#token=(\S+)/)![1];
    expect((await open(token).expect(200)).body.number).toBe(car.number);

    // Run again (a second process, or the next morning): nothing more this week.
    expect(await remindOverdueRequests()).not.toContain(car.number);
    expect(await OutboxMail.count({ where: { relatedType: 'corrective-action', relatedId: String(car.id) } })).toBe(mails.length);
  });

  it('lets inspection resume after discontinuation on an accepted request of the same supplier and part', async () => {
    const pair = await supplierWithQualityContact();
    // ISO 2859-1, 9.3 and 9.4: two lots not accepted on normal start tightened inspection, five not
    // accepted on tightened discontinue acceptance, which resumes (on tightened) once the supplier has acted.
    for (let i = 0; i < 7; i++) await decide((await pair.receive(5)).lotId, 'reject');
    const pending = await raiseRequest([(await ncrOf(pair)).id]);
    const accepted = await raiseRequest([(await ncrOf(pair)).id]);
    await answer((await mailedToken(accepted.id)).token).expect(201);
    const quality = await as('quality');
    await quality
      .post(`/api/corrective-actions/${accepted.id}/review`)
      .send({ decision: 'accept', password: DEMO_PASSWORD, meaningAcknowledged: true })
      .expect(200);
    const elsewhere = await requestWithLink();

    const resume = (correctiveActionId: number) =>
      quality.post(`/api/switching/${pair.supplierId}/${pair.partId}/resume`).send({
        correctiveAction: 'Polishing pitch replaced; retardance of every plate measured before packing.',
        correctiveActionId,
        password: DEMO_PASSWORD,
        meaningAcknowledged: true,
      });
    expect((await resume(elsewhere.car.id).expect(400)).body.error.details).toEqual([
      { path: 'correctiveActionId', message: 'Not a request of this supplier and part' },
    ]);
    expect((await resume(pending.id).expect(409)).body.error.message).toBe(
      `${pending.number} is not accepted: the supplier's answer must be accepted before inspection resumes on it`,
    );
    const resumed = await resume(accepted.id).expect(201);
    expect(resumed.body.state).toMatchObject({ severity: 'tightened', stopped: false });
    const history = (await quality.get(`/api/switching/${pair.supplierId}/${pair.partId}`).expect(200)).body.history;
    expect(history[0]).toMatchObject({ kind: 'resume', reference: accepted.number, correctiveActionId: accepted.id });
  });

  it('rate-limits the response form per network address', async () => {
    for (let i = 0; i < 10; i++) expect((await answer('not-a-token', [], {})).status).toBe(400);
    const limited = await answer('not-a-token', [], {});
    expect(limited.status).toBe(429);
    expect(limited.body.error).toMatchObject({
      code: 'too_many_requests',
      message: expect.stringMatching(/^Too many requests from your network address\. Try again in \d+ minutes\.$/),
    });
    expect(limited.headers['ratelimit-policy']).toBeDefined();
  });
});
