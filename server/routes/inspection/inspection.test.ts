import { beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import nodemailer from 'nodemailer';
import { sequelize } from '../../../db';
import { Instrument, MeasurementFile, OutboxMail, PieceResult, Reading } from '../../../db/models';
import { app, as } from '../../../tests/helpers/api';
import { benchFile, documentText, sampleOf } from '../../../tests/helpers/bench';
import { approvedDeviation } from '../../../tests/helpers/deviations';
import { receivedLot } from '../../../tests/helpers/receivedLot';
import { startMailCatcher } from '../../mail/catcher';
import { readCaughtMail } from '../../mail/caughtMail';
import { deliverDueMail } from '../../mail/outbox';

const TODAY = new Date().toISOString().slice(0, 10);

let inspector: Awaited<ReturnType<typeof as>>;
let quality: Awaited<ReturnType<typeof as>>;
beforeAll(async () => {
  inspector = await as('inspector');
  quality = await as('quality');
});

const upload = (path: string, name: string, content: string) =>
  inspector.post(path).attach('files', Buffer.from(content), { filename: name, contentType: 'text/csv' });

function sign(lotId: number, decision: string, expectedDispositionId: number | null, extra: Record<string, unknown> = {}) {
  return quality
    .post(`/api/inspection/lots/${lotId}/dispositions`)
    .send({ decision, password: 'phaselot-demo', meaningAcknowledged: true, expectedDispositionId, ...extra });
}

describe('inspection of a lot through the API', () => {
  it('draws a reproducible ISO 2859-1 sample for the lot', async () => {
    const lot = await receivedLot({ quantity: 300, level: 'II', aql: 1 });
    const { view, sample } = await sampleOf(lot.lotId);
    // ISO 2859-1:1999 Table 1 / Table 2-A (from memory): 281-500 at level II is code H, n = 50; AQL 1.0 gives Ac 1 / Re 2.
    expect(view.plan).toMatchObject({ codeLetter: 'H', sampleSize: 50, accept: 1, reject: 2, severity: 'normal' });
    expect(sample).toHaveLength(50);
    expect(new Set(sample).size).toBe(50);
    const again = await sampleOf(lot.lotId);
    expect(again.sample).toEqual(sample);
    expect(view.plan.oc[0]).toEqual({ percentDefective: 0, pa: 1 });
  });

  it('previews every row with its errors and saves nothing; a file with errors cannot be committed', async () => {
    const lot = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    const lines = benchFile(sample).split('\n');
    lines[6] = lines[6].replace(/,0\.\d+,/, ',abc,'); // a number turned into text on line 7
    lines.push('ZZ-9999,632.8,H,1,1,0,0,0');
    const broken = lines.join('\n');
    const filesBefore = await MeasurementFile.count();

    const preview = await upload(`/api/inspection/lots/${lot.lotId}/measurements/preview`, 'bench.csv', broken).expect(200);
    const [file] = preview.body.files;
    expect(file.errors).toEqual(
      expect.arrayContaining([expect.objectContaining({ line: 7 }), { line: lines.length, message: `Serial ZZ-9999 is not in lot L-${lot.lotId}` }]),
    );
    expect(file.pieces.length).toBeGreaterThan(0);

    const refused = await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'bench.csv', broken).expect(422);
    expect(refused.body.error.code).toBe('measurement_errors');
    expect(await MeasurementFile.count()).toBe(filesBefore);
  });

  it('refuses readings from an instrument past its calibration date', async () => {
    const lot = await receivedLot({ quantity: 10 });
    const { sample } = await sampleOf(lot.lotId);
    const response = await upload(`/api/inspection/lots/${lot.lotId}/measurements/preview`, 'old.csv', benchFile(sample, [], 'BENCH-0')).expect(200);
    expect(response.body.files[0].fatal).toMatch(/BENCH-0 was not in calibration .* its readings are refused/);
  });

  describe('bench files that cannot slip past the rules', () => {
    const instrumentId = async (code: string) => (await Instrument.findOne({ where: { code } }))!.id;
    const uploadOn = (path: string, name: string, content: string, instrument: number) =>
      inspector.post(path).field('instrumentId', String(instrument)).attach('files', Buffer.from(content), { filename: name, contentType: 'text/csv' });

    it('refuses a file with a byte-order mark that names an instrument out of calibration, whatever the form says', async () => {
      const lot = await receivedLot({ quantity: 10 });
      const { sample } = await sampleOf(lot.lotId);
      const filesBefore = await MeasurementFile.count();
      // The instrument line first, right behind the byte-order mark.
      const old = benchFile(sample, [], 'BENCH-0').replace(/^# Invented.*\n/, '');
      for (const text of [`\uFEFF${old}`, old.replaceAll('\n', '\r')]) {
        const refused = await uploadOn(`/api/inspection/lots/${lot.lotId}/measurements`, 'old.csv', text, await instrumentId('BENCH-2')).expect(422);
        expect(refused.body.error.details[0].fatal).toMatch(/^line 1: the file was measured on BENCH-0, not on BENCH-2 chosen for the upload/);
        const preview = await upload(`/api/inspection/lots/${lot.lotId}/measurements/preview`, 'old.csv', text).expect(200);
        expect(preview.body.files[0].fatal).toMatch(/BENCH-0 was not in calibration .* its readings are refused/);
      }
      expect(await MeasurementFile.count()).toBe(filesBefore);
    });

    it('stores the same readings from LF, CRLF and CR-only files with a byte-order mark, with their lines and the instrument line', async () => {
      const lot = await receivedLot({ quantity: 8 });
      const { sample } = await sampleOf(lot.lotId);
      const lf = benchFile(sample);
      const stored = [];
      for (const [name, text] of [
        ['lf.csv', lf],
        ['crlf.csv', `\uFEFF${lf.replaceAll('\n', '\r\n')}`],
        ['cr.csv', `\uFEFF${lf.replaceAll('\n', '\r')}`],
      ]) {
        const committed = await upload(`/api/inspection/lots/${lot.lotId}/measurements`, name, text).expect(201);
        const { fileId, rows } = committed.body.files[0];
        expect(rows).toBe(sample.length * 6);
        const file = await MeasurementFile.findByPk(fileId);
        expect(file!.metadata).toMatchObject({ instrument: 'BENCH-2', date: TODAY });
        expect(file!.rowCount).toBe(rows);
        stored.push(
          (await Reading.findAll({ where: { fileId }, order: [['line', 'ASC']] })).map((r) => ({
            line: r.line,
            serial: r.serial,
            wavelengthNm: r.wavelengthNm,
            fields: r.fields,
          })),
        );
      }
      // The header is line 5 of these files (four # lines before it).
      expect(stored[0][0]).toMatchObject({
        line: 6,
        serial: sample[0],
        wavelengthNm: 632.8,
        fields: { serial: sample[0], wavelength_nm: '632.8', input: 'H' },
      });
      expect(stored[0].every((r) => r.serial !== '')).toBe(true);
      expect(stored[1]).toEqual(stored[0]);
      expect(stored[2]).toEqual(stored[0]);
    });

    it('refuses a header-only file, once and again, and saves nothing', async () => {
      const lot = await receivedLot({ quantity: 5 });
      const headerOnly = benchFile([]);
      const filesBefore = await MeasurementFile.count();
      for (let attempt = 0; attempt < 2; attempt++) {
        const refused = await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'empty.csv', headerOnly).expect(422);
        expect(refused.body.error.details[0].fatal).toBe('line 5: the header is not followed by any data rows');
      }
      expect(await MeasurementFile.count()).toBe(filesBefore);
    });

    it('refuses a file whose rows are all repeated, naming both lines of each pair', async () => {
      const lot = await receivedLot({ quantity: 5 });
      const { sample } = await sampleOf(lot.lotId);
      const lines = benchFile(sample.slice(0, 1)).trimEnd().split('\n');
      const doubled = [...lines.slice(0, 5), ...lines.slice(5).flatMap((row) => [row, row])].join('\n');
      const preview = await upload(`/api/inspection/lots/${lot.lotId}/measurements/preview`, 'twice.csv', doubled).expect(200);
      expect(preview.body.files[0].errors).toHaveLength(6);
      expect(preview.body.files[0].errors[0]).toEqual({ line: 7, message: `repeats line 6: ${sample[0]} at 632.8 nm with input H is already measured there` });
      const filesBefore = await MeasurementFile.count();
      await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'twice.csv', doubled).expect(422);
      expect(await MeasurementFile.count()).toBe(filesBefore);
    });

    it('refuses a file whose date is not a date or lies in the future', async () => {
      const lot = await receivedLot({ quantity: 5 });
      const { sample } = await sampleOf(lot.lotId);
      for (const [date, message] of [
        ['2026/11/30', 'line 4: the date "2026/11/30" is not a date (expected YYYY-MM-DD)'],
        ['2999-01-01', 'line 4: the date 2999-01-01 is in the future'],
      ]) {
        const preview = await upload(
          `/api/inspection/lots/${lot.lotId}/measurements/preview`,
          'dated.csv',
          benchFile(sample).replace(`# date: ${TODAY}`, `# date: ${date}`),
        ).expect(200);
        expect(preview.body.files[0].fatal).toBe(message);
      }
    });
  });

  it('commits readings, accepts with a signature, issues a certificate whose PDF shows the stored numbers, then supersedes it by a rejection mailed to the buyer', async () => {
    const lot = await receivedLot({ quantity: 60, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    const committed = await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'bench-ok.csv', benchFile(sample)).expect(201);
    expect(committed.body.files[0]).toMatchObject({ pieces: sample.length, rows: sample.length * 6 });
    expect(committed.body.files[0].sha256).toMatch(/^[0-9a-f]{64}$/);

    const { view } = await sampleOf(lot.lotId);
    expect(view.lot.state).toBe('awaiting-disposition');
    expect(view.verdict).toMatchObject({ proposal: 'accept', defectives: 0 });

    // The signature needs the password and the acknowledged meaning.
    await sign(lot.lotId, 'accept', null, { password: 'wrong-password' }).expect(401);
    await sign(lot.lotId, 'accept', null, { meaningAcknowledged: false }).expect(400);
    const accepted = await sign(lot.lotId, 'accept', null).expect(201);
    const certificate = accepted.body.documents.find((d: { kind: string }) => d.kind === 'certificate');
    expect(certificate.number).toMatch(/^PLC-\d{4}-\d{5}$/);

    const [{ in_stock }] = await sequelize.query<{ in_stock: string }>(
      `SELECT count(*) AS in_stock FROM pieces p JOIN piece_locations pl ON pl.piece_id = p.id JOIN locations l ON l.id = pl.location_id WHERE p.lot_id = :lot AND l.kind = 'stock' AND p.state = 'in-stock'`,
      { type: QueryTypes.SELECT, replacements: { lot: lot.lotId } },
    );
    expect(Number(in_stock)).toBe(60);

    // Round trip: the stored result of a piece and the certificate's text show the same numbers.
    const text = await documentText(certificate.number);
    const [stored] = await PieceResult.findAll({ include: [], where: { fileId: committed.body.files[0].fileId }, limit: 1, order: [['id', 'ASC']] });
    expect(text).toContain(certificate.number);
    expect(text).toContain(String(stored.result.retardanceWaves === null ? '' : (stored.result.retardanceWaves as number).toFixed(4)));
    expect(text).toContain((stored.result.retardanceErrorWaves as number).toFixed(4).replace(/^(\d)/, '+$1'));
    expect(text).toContain('0.25 λ at 632.8 nm');
    expect(text).toContain('±0.003 λ');
    expect(text).toContain(certificate.dataHash);

    // The serial's history runs from the supplier through its readings to the certificate.
    const piece = await (await as('auditor')).get(`/api/pieces/${sample[0]}`).expect(200);
    expect(piece.body.data[0].readings).toEqual([expect.objectContaining({ verdict: 'pass', instrument: 'BENCH-2', file: 'bench-ok.csv', current: true })]);
    expect(piece.body.data[0].documents.map((d: { number: string }) => d.number)).toContain(certificate.number);

    // Genuine and current; a forged hash is not.
    const genuine = await request(app).get('/api/certificates/verify').query({ number: certificate.number, hash: certificate.dataHash }).expect(200);
    expect(genuine.body).toMatchObject({ genuine: true, current: true, document: { number: certificate.number, decision: 'Accept' } });
    const forged = await request(app)
      .get('/api/certificates/verify')
      .query({ number: certificate.number, hash: 'f'.repeat(64) })
      .expect(200);
    expect(forged.body.genuine).toBe(false);

    // A rejection supersedes the acceptance, revokes the certificate and queues the buyer's mail.
    const rejected = await sign(lot.lotId, 'reject', accepted.body.dispositionId, { justification: 'Customer return showed cracked plates' }).expect(201);
    const revoked = await request(app).get('/api/certificates/verify').query({ number: certificate.number, hash: certificate.dataHash }).expect(200);
    expect(revoked.body).toMatchObject({ genuine: true, current: false });
    const mail = await OutboxMail.findOne({ where: { relatedType: 'lot', relatedId: String(lot.lotId) } });
    expect(mail).toMatchObject({ recipients: ['buyer@phaselot.test'], status: 'queued' });
    expect(mail!.attachments[0].filename).toBe(`${rejected.body.documents[0].number}.pdf`);

    // The catcher of this test receives it once the worker runs.
    const dir = mkdtempSync(join(tmpdir(), 'phaselot-reject-'));
    const catcher = await startMailCatcher({ port: 0, dir });
    try {
      await deliverDueMail(nodemailer.createTransport(`smtp://127.0.0.1:${catcher.port}`));
      const caught = (await readCaughtMail(dir)).find((m) => m.subject.includes(`supplier lot SL-`));
      expect(caught?.to).toBe('buyer@phaselot.test');
      expect(caught?.attachments[0]).toMatchObject({ contentType: 'application/pdf' });
    } finally {
      await catcher.close();
    }
    const [{ returned }] = await sequelize.query<{ returned: string }>(`SELECT count(*) AS returned FROM pieces WHERE lot_id = :lot AND state = 'returned'`, {
      type: QueryTypes.SELECT,
      replacements: { lot: lot.lotId },
    });
    expect(Number(returned)).toBe(60);
  });

  it('rejects a lot whose sample reaches Re, and lets only one of two simultaneous signatures through', async () => {
    const lot = await receivedLot({ quantity: 60, level: 'II', aql: 1 });
    const { sample } = await sampleOf(lot.lotId);
    await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'bench.csv', benchFile(sample, sample.slice(0, 3))).expect(201);
    const { view } = await sampleOf(lot.lotId);
    expect(view.verdict.proposal).toBe('reject');
    await sign(lot.lotId, 'accept', null).expect(409);
    const deviation = await approvedDeviation(lot.supplierId, lot.partId);
    const [first, second] = await Promise.all([
      sign(lot.lotId, 'reject', null),
      sign(lot.lotId, 'use-as-is', null, { deviationId: deviation.id, justification: 'Test fixture only, not for product' }),
    ]);
    expect([first.status, second.status].sort()).toEqual([201, 409]);
  });

  it('supersedes a piece result with a new upload and keeps the old one', async () => {
    const lot = await receivedLot({ quantity: 8 });
    const { sample } = await sampleOf(lot.lotId);
    await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'first.csv', benchFile(sample, [sample[0]])).expect(201);
    await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'second.csv', benchFile([sample[0]])).expect(201);
    const pieceId = (await sampleOf(lot.lotId)).view.pieces.find((p: { serial: string }) => p.serial === sample[0]).id;
    const history = await PieceResult.findAll({ where: { pieceId }, order: [['id', 'ASC']] });
    expect(history.map((h) => [h.verdict, h.supersededByFileId !== null])).toEqual([
      ['fail', true],
      ['pass', false],
    ]);
  });

  it('keeps each step to its role', async () => {
    const lot = await receivedLot({ quantity: 5 });
    await (await as('quality')).post(`/api/inspection/lots/${lot.lotId}/measurements/preview`).attach('files', Buffer.from('x'), 'x.csv').expect(403);
    await (await as('inspector')).post(`/api/inspection/lots/${lot.lotId}/dispositions`).send({}).expect(403);
    await (await as('auditor')).get(`/api/inspection/lots/${lot.lotId}`).expect(200);
  });
});
