import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../../db';
import { as } from '../../../tests/helpers/api';
import { benchFile, documentText, sampleOf, signDecision } from '../../../tests/helpers/bench';
import { TINY_PDF, uniqueTag } from '../../../tests/helpers/purchasing';
import { receivedLot } from '../../../tests/helpers/receivedLot';

const bench = (code: string) => ({
  code,
  kind: 'stokes-polarimeter',
  description: 'Six-state polarimeter, HeNe source',
  uncertaintyWaves: 0.0008,
  uncertaintyDeg: 0.05,
  calibratedOn: '2026-06-01',
  calibrationDueOn: '2027-06-01',
});

/** A calibration as the form sends it: text fields beside the certificate. */
const calibrationFields = {
  calibratedOn: '2026-11-20',
  dueOn: '2027-11-20',
  performedBy: 'Oskarvale Metrology Laboratory',
  certificateNumber: 'OML-26-1193',
  uncertaintyRetardance: '0.45',
  uncertaintyRetardanceUnit: 'nm',
  uncertaintyAngleDeg: '0.04',
  uncertaintyNote: 'k = 2 at 632.8 nm',
};

async function registered(overrides: Partial<ReturnType<typeof bench>> = {}) {
  const quality = await as('quality');
  const created = await quality
    .post('/api/instruments')
    .send({ ...bench(`T-CAL-${uniqueTag()}`), ...overrides })
    .expect(201);
  return { quality, instrument: created.body as { id: number; code: string } };
}

function postCalibration(who: Awaited<ReturnType<typeof as>>, instrumentId: number, fields: Record<string, string>, certificate?: [Buffer, string, string]) {
  let req = who.post(`/api/instruments/${instrumentId}/calibrations`);
  for (const [name, value] of Object.entries(fields)) req = req.field(name, value);
  return certificate ? req.attach('certificate', certificate[0], { filename: certificate[1], contentType: certificate[2] }) : req;
}

describe('/api/instruments', () => {
  it('lets the quality manager register an instrument and edit its entry, whose dates follow its calibration records', async () => {
    const { quality, instrument } = await registered();
    const edited = await quality
      .put(`/api/instruments/${instrument.id}`)
      .send({ ...bench(instrument.code), s3Sign: -1, calibratedOn: '2025-01-10', calibrationDueOn: '2026-01-10' })
      .expect(200);
    // The entry changes; the dates sent with it do not (they change only through a record).
    expect(edited.body).toMatchObject({ s3Sign: -1, calibratedOn: '2026-06-01', calibrationDueOn: '2027-06-01', calibrationCurrent: true });
    const detail = await (await as('auditor')).get(`/api/instruments/${instrument.id}`).expect(200);
    expect(detail.body.calibrations).toEqual([
      expect.objectContaining({ calibratedOn: '2026-06-01', dueOn: '2027-06-01', carriedOver: false, certificate: null, standing: 'in-force' }),
    ]);
    const list = await (await as('auditor')).get('/api/instruments').expect(200);
    expect(list.body.data.map((i: { code: string }) => i.code)).toContain(instrument.code);
  });

  it('refuses a due date before the calibration date and an unknown kind', async () => {
    const quality = await as('quality');
    const response = await quality
      .post('/api/instruments')
      .send({ ...bench('T-BAD'), kind: 'oscilloscope', calibrationDueOn: '2026-01-01' })
      .expect(400);
    expect(response.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['kind']);
    const dates = await quality
      .post('/api/instruments')
      .send({ ...bench('T-BAD'), calibrationDueOn: '2026-01-01' })
      .expect(400);
    expect(dates.body.error.details).toEqual([{ path: 'calibrationDueOn', message: 'The due date must come after the calibration date' }]);
  });

  it('does not let an inspector or auditor change the register', async () => {
    await (await as('inspector')).post('/api/instruments').send(bench('T-NOPE')).expect(403);
    await (await as('auditor')).post('/api/instruments').send(bench('T-NOPE')).expect(403);
  });
});

describe('calibration records', () => {
  it('records a calibration with its certificate PDF: newest first, the current one in force, the certificate served back, audited', async () => {
    const { quality, instrument } = await registered();
    const recorded = await postCalibration(quality, instrument.id, calibrationFields, [TINY_PDF, 'OML-26-1193.pdf', 'application/pdf']).expect(201);
    expect(recorded.body).toMatchObject({ calibratedOn: '2026-11-20', calibrationDueOn: '2027-11-20', calibrationCurrent: true });
    const [newest, older] = recorded.body.calibrations;
    expect(newest).toMatchObject({
      calibratedOn: '2026-11-20',
      dueOn: '2027-11-20',
      performedBy: 'Oskarvale Metrology Laboratory',
      certificateNumber: 'OML-26-1193',
      uncertaintyRetardance: 0.45,
      uncertaintyRetardanceUnit: 'nm',
      uncertaintyAngleDeg: 0.04,
      uncertaintyNote: 'k = 2 at 632.8 nm',
      certificate: { name: 'OML-26-1193.pdf', sizeBytes: TINY_PDF.length },
      standing: 'in-force',
      carriedOver: false,
    });
    expect(newest.recordedBy).toEqual(expect.any(String));
    expect(older).toMatchObject({ calibratedOn: '2026-06-01', standing: 'superseded' });

    const pdf = await (await as('inspector')).get(`/api/instruments/${instrument.id}/calibrations/${newest.id}/certificate`).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(Buffer.from(pdf.body as Buffer).equals(TINY_PDF)).toBe(true);

    const [audit] = await sequelize.query<{ after: { calibrationId: number; certificateNumber: string } }>(
      `SELECT after FROM audit_events WHERE action = 'instrument.calibration.record' AND entity_id = :id ORDER BY seq DESC LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { id: String(instrument.id) } },
    );
    expect(audit.after).toMatchObject({ calibrationId: newest.id, certificateNumber: 'OML-26-1193' });
  });

  it('attaches a certificate to a record without one, once', async () => {
    const { quality, instrument } = await registered();
    const [first] = (await quality.get(`/api/instruments/${instrument.id}`).expect(200)).body.calibrations;
    const attach = () =>
      quality
        .post(`/api/instruments/${instrument.id}/calibrations/${first.id}/certificate`)
        .attach('certificate', TINY_PDF, { filename: 'first.pdf', contentType: 'application/pdf' });
    const attached = await attach().expect(200);
    expect(attached.body.calibrations[0].certificate).toEqual({ name: 'first.pdf', sizeBytes: TINY_PDF.length });
    const again = await attach().expect(409);
    expect(again.body.error.message).toMatch(/already has its certificate \(first\.pdf\)/);
  });

  it('refuses a certificate that is not a PDF, whatever it is called, and keeps nothing', async () => {
    const { quality, instrument } = await registered();
    // A PNG's signature (PNG specification, section 5.2) under a .pdf name.
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
    const refused = await postCalibration(quality, instrument.id, calibrationFields, [png, 'certificate.pdf', 'application/pdf']).expect(415);
    expect(refused.body.error.message).toBe('The certificate certificate.pdf is not a PDF (its content is image/png)');
    const text = await postCalibration(quality, instrument.id, calibrationFields, [Buffer.from('not a pdf'), 'notes.pdf', 'application/pdf']).expect(415);
    expect(text.body.error.message).toBe('The certificate notes.pdf is not a PDF');
    const detail = await quality.get(`/api/instruments/${instrument.id}`).expect(200);
    expect(detail.body.calibrations).toHaveLength(1);
  });

  it('refuses a record with its fields wrong, naming each', async () => {
    const { quality, instrument } = await registered();
    const response = await postCalibration(quality, instrument.id, {
      calibratedOn: '2026-11-20',
      dueOn: '2026-11-01',
      performedBy: '',
      uncertaintyRetardance: '0.5',
    }).expect(400);
    expect(response.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['dueOn', 'performedBy', 'uncertaintyRetardanceUnit']);
    const dates = await postCalibration(quality, instrument.id, { ...calibrationFields, dueOn: '2026-11-01', uncertaintyRetardanceUnit: '' }).expect(400);
    expect(dates.body.error.details).toEqual([
      { path: 'dueOn', message: 'The due date must come after the calibration date' },
      { path: 'uncertaintyRetardanceUnit', message: 'Say whether the retardance uncertainty is in waves or nm' },
    ]);
    const future = await postCalibration(quality, instrument.id, { ...calibrationFields, calibratedOn: '2999-01-01', dueOn: '2999-12-01' }).expect(400);
    expect(future.body.error.details).toEqual([{ path: 'calibratedOn', message: 'The calibration date cannot be in the future' }]);
  });

  it('lets the quality manager and the admin record calibrations, no other role', async () => {
    const { instrument } = await registered();
    await postCalibration(await as('admin'), instrument.id, calibrationFields).expect(201);
    for (const role of ['inspector', 'clerk', 'buyer', 'auditor'] as const) await postCalibration(await as(role), instrument.id, calibrationFields).expect(403);
  });

  it('keeps the instrument dates to its newest record: a direct change is refused by the database', async () => {
    const { instrument } = await registered();
    await expect(
      sequelize.query(`UPDATE instruments SET calibration_due_on = '2030-01-01' WHERE id = :id`, { replacements: { id: instrument.id } }),
    ).rejects.toThrow(/follow its calibration records/);
  });
});

describe('the calibration gate on bench files, over the records', () => {
  // An instrument calibrated for 2025 (A), then, after a gap, from March to June 2026 (B): lapsed today.
  async function twoRecords() {
    const { quality, instrument } = await registered({ calibratedOn: '2025-01-01', calibrationDueOn: '2025-12-31' });
    await postCalibration(quality, instrument.id, { calibratedOn: '2026-03-01', dueOn: '2026-06-30', performedBy: 'In-house check' }).expect(201);
    const lot = await receivedLot({ quantity: 10 });
    const { sample } = await sampleOf(lot.lotId);
    const inspector = await as('inspector');
    const preview = async (day: string) => {
      const text = benchFile(sample, [], instrument.code).replace(/^# date: .*$/m, `# date: ${day}`);
      const response = await inspector
        .post(`/api/inspection/lots/${lot.lotId}/measurements/preview`)
        .attach('files', Buffer.from(text), { filename: `${day}.csv`, contentType: 'text/csv' })
        .expect(200);
      return response.body.files[0] as { fatal?: string; pieces: unknown[] };
    };
    return { code: instrument.code, preview };
  }

  // Common practice: a reading counts when its day lies within a calibration's interval, both ends included.
  it('accepts a day covered only by the older record, and both ends of a record', async () => {
    const { preview } = await twoRecords();
    for (const day of ['2025-06-15', '2025-01-01', '2025-12-31', '2026-03-01', '2026-06-30']) {
      const file = await preview(day);
      expect(file.fatal, day).toBeUndefined();
      expect(file.pieces.length, day).toBeGreaterThan(0);
    }
  });

  it('refuses a day in the gap between records, naming the record that lapsed', async () => {
    const { code, preview } = await twoRecords();
    expect((await preview('2026-01-15')).fatal).toBe(
      `Instrument ${code} was not in calibration on 2026-01-15 (calibrated 2025-01-01, due 2025-12-31): its readings are refused`,
    );
  });

  it('refuses a day after the last due date, and one before the first calibration', async () => {
    const { code, preview } = await twoRecords();
    expect((await preview('2026-07-01')).fatal).toBe(
      `Instrument ${code} was not in calibration on 2026-07-01 (calibrated 2026-03-01, due 2026-06-30): its readings are refused`,
    );
    expect((await preview('2024-12-31')).fatal).toBe(
      `Instrument ${code} was not in calibration on 2024-12-31 (calibrated 2025-01-01, due 2025-12-31): its readings are refused`,
    );
  });
});

describe('the lot report', () => {
  it('names the calibration the readings were taken under, not the newest one', async () => {
    const { quality, instrument } = await registered({ calibratedOn: '2025-01-01', calibrationDueOn: '2025-12-31' });
    await postCalibration(quality, instrument.id, { calibratedOn: '2026-03-01', dueOn: '2027-03-01', performedBy: 'In-house check' }).expect(201);
    const lot = await receivedLot({ quantity: 10 });
    const { sample } = await sampleOf(lot.lotId);
    const text = benchFile(sample, [], instrument.code).replace(/^# date: .*$/m, '# date: 2025-06-15');
    await (
      await as('inspector')
    )
      .post(`/api/inspection/lots/${lot.lotId}/measurements`)
      .attach('files', Buffer.from(text), { filename: 'last-year.csv', contentType: 'text/csv' })
      .expect(201);
    const signed = await signDecision(lot.lotId, 'accept', null);
    const report = signed.body.documents.find((d: { kind: string }) => d.kind === 'inspection-report');
    const reportText = (await documentText(report.number)).replace(/\s+/g, ' ');
    expect(reportText).toContain(`${instrument.code} calibrated 2025-01-01, due 2025-12-31`);
    expect(reportText).not.toContain('calibrated 2026-03-01');
  });
});

describe("an instrument's bench files", () => {
  it('lists the files measured with it, newest first, linked to their lots', async () => {
    const lot = await receivedLot({ quantity: 8 });
    const { sample } = await sampleOf(lot.lotId);
    const { quality, instrument } = await registered({ calibratedOn: '2026-01-05', calibrationDueOn: '2027-01-05' });
    const inspector = await as('inspector');
    for (const name of ['first.csv', 'second.csv']) {
      await inspector
        .post(`/api/inspection/lots/${lot.lotId}/measurements`)
        .attach('files', Buffer.from(benchFile(sample, [], instrument.code)), { filename: name, contentType: 'text/csv' })
        .expect(201);
    }
    const page = await quality.get(`/api/instruments/${instrument.id}/files?pageSize=1`).expect(200);
    expect(page.body).toMatchObject({ total: 2, totalExact: true });
    expect(page.body.data).toEqual([expect.objectContaining({ name: 'second.csv', lotId: lot.lotId, lot: `L-${lot.lotId}`, method: 'stokes' })]);
    const next = await quality.get(`/api/instruments/${instrument.id}/files?pageSize=1&page=2`).expect(200);
    expect(next.body.data.map((f: { name: string }) => f.name)).toEqual(['first.csv']);
    const csv = await quality.get(`/api/instruments/${instrument.id}/files/export.csv`).expect(200);
    expect(csv.text.trim().split('\n')).toHaveLength(3);
  });
});
