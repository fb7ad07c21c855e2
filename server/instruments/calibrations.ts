// Calibration records of the instruments: recording one (with its certificate PDF), attaching a
// certificate to a record that has none, the history for the instrument's page, the gate that bench
// files pass (a reading day must lie inside some record), and the instruments by due date.
import { fileTypeFromBuffer } from 'file-type';
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Instrument, InstrumentCalibration, User } from '../../db/models';
import { coverageOn, todayUtc } from '../../shared/calibration';
import { calibrationInputSchema, MAX_CERTIFICATE_BYTES, type CalibrationInput } from '../../shared/schemas/instruments';
import { recordAudit, type AuditActor } from '../audit/record';
import { AppError, badRequest, conflict, notFound } from '../http/errors';
import { storeBlob } from '../storage/blobs';

export type UploadedFile = { originalname: string; buffer: Buffer; size: number };

/** A certificate is kept only when its content is a PDF, whatever the file is called. */
async function checkCertificate(file: UploadedFile) {
  if (file.size === 0) throw badRequest(`The certificate ${file.originalname} is empty`);
  if (file.size > MAX_CERTIFICATE_BYTES) throw new AppError(413, 'upload', `The certificate ${file.originalname} is larger than 10 MB`);
  const type = await fileTypeFromBuffer(file.buffer);
  if (type?.mime !== 'application/pdf') {
    throw new AppError(415, 'unsupported_file', `The certificate ${file.originalname} is not a PDF${type ? ` (its content is ${type.mime})` : ''}`);
  }
  return { name: file.originalname.slice(0, 255), data: file.buffer };
}

/** What the audit trail keeps of a record: its fields, the certificate by name and stored key. */
const audited = (c: InstrumentCalibration) => ({
  calibratedOn: c.calibratedOn,
  dueOn: c.dueOn,
  performedBy: c.performedBy,
  certificateNumber: c.certificateNumber,
  uncertaintyRetardance: c.uncertaintyRetardance,
  uncertaintyRetardanceUnit: c.uncertaintyRetardanceUnit,
  uncertaintyAngleDeg: c.uncertaintyAngleDeg,
  uncertaintyNote: c.uncertaintyNote,
  certificate: c.certificateName ? { name: c.certificateName, sizeBytes: c.certificateSizeBytes, storageKey: c.certificateStorageKey } : null,
});

async function lockedInstrument(instrumentId: number, transaction: Transaction) {
  const instrument = await Instrument.findByPk(instrumentId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!instrument) throw notFound('Instrument');
  return instrument;
}

/** Adds a calibration record in `transaction` (the instrument's registration writes its first one). */
export async function addCalibration(
  actor: AuditActor,
  instrumentId: number,
  input: CalibrationInput,
  certificate: UploadedFile | undefined,
  transaction: Transaction,
) {
  const parsed = calibrationInputSchema.parse(input);
  const checked = certificate && (await checkCertificate(certificate));
  const record = await InstrumentCalibration.create(
    {
      instrumentId,
      calibratedOn: parsed.calibratedOn,
      dueOn: parsed.dueOn,
      performedBy: parsed.performedBy,
      certificateNumber: parsed.certificateNumber,
      uncertaintyRetardance: parsed.uncertaintyRetardance ?? null,
      uncertaintyRetardanceUnit: parsed.uncertaintyRetardanceUnit ?? null,
      uncertaintyAngleDeg: parsed.uncertaintyAngleDeg ?? null,
      uncertaintyNote: parsed.uncertaintyNote,
      certificateStorageKey: checked ? await storeBlob(checked.data, transaction) : null,
      certificateName: checked?.name ?? null,
      certificateSizeBytes: checked?.data.length ?? null,
      recordedBy: actor.id,
    },
    { transaction },
  );
  await recordAudit(
    actor,
    { action: 'instrument.calibration.record', entityType: 'instrument', entityId: instrumentId, after: { calibrationId: record.id, ...audited(record) } },
    transaction,
  );
  return record;
}

/** Records a calibration of an instrument, with its certificate PDF when one is sent. */
export async function recordCalibration(actor: AuditActor, instrumentId: number, input: CalibrationInput, certificate?: UploadedFile) {
  // Refused content is refused before anything is locked or stored.
  if (certificate) await checkCertificate(certificate);
  return inTransaction(async (transaction) => {
    await lockedInstrument(instrumentId, transaction);
    return addCalibration(actor, instrumentId, input, certificate, transaction);
  });
}

/** Attaches the certificate PDF to a record that has none (a carried-over record, say); a record's certificate is never replaced. */
export async function attachCertificate(actor: AuditActor, instrumentId: number, calibrationId: number, file: UploadedFile) {
  const checked = await checkCertificate(file);
  return inTransaction(async (transaction) => {
    const record = await InstrumentCalibration.findOne({ where: { id: calibrationId, instrumentId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!record) throw notFound('Calibration record');
    if (record.certificateStorageKey) {
      throw conflict(`The calibration of ${record.calibratedOn} already has its certificate (${record.certificateName}); record a new calibration instead`);
    }
    const before = audited(record);
    record.set({ certificateStorageKey: await storeBlob(checked.data, transaction), certificateName: checked.name, certificateSizeBytes: checked.data.length });
    await record.save({ transaction });
    await recordAudit(
      actor,
      { action: 'instrument.calibration.certificate', entityType: 'instrument', entityId: instrumentId, before, after: { calibrationId, ...audited(record) } },
      transaction,
    );
    return record;
  });
}

export type CalibrationRecord = InstrumentCalibration & { recorder: string | null };
export type InstrumentRecord = { instrument: Instrument; calibrations: CalibrationRecord[] };

/** An instrument with its calibration records, newest first, each with who recorded it. */
export async function findInstrument(id: number): Promise<InstrumentRecord> {
  const instrument = await Instrument.findByPk(id);
  if (!instrument) throw notFound('Instrument');
  const records = await InstrumentCalibration.findAll({
    where: { instrumentId: id },
    order: [
      ['calibratedOn', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  const recorderIds = [...new Set(records.flatMap((r) => (r.recordedBy === null ? [] : [r.recordedBy])))];
  const users = new Map((await User.findAll({ where: { id: recorderIds }, attributes: ['id', 'name', 'email'] })).map((u) => [u.id, u.name || u.email]));
  const calibrations = records.map((r) => Object.assign(r, { recorder: r.recordedBy === null ? null : (users.get(r.recordedBy) ?? null) }));
  return { instrument, calibrations };
}

/** Refuses with 404 an instrument that is not there (before listing what was measured with it). */
export async function requireInstrument(id: number): Promise<void> {
  if (!(await Instrument.findByPk(id, { attributes: ['id'] }))) throw notFound('Instrument');
}

/** The stored certificate of one record. */
export async function calibrationCertificate(instrumentId: number, calibrationId: number) {
  const record = await InstrumentCalibration.findOne({ where: { id: calibrationId, instrumentId } });
  if (!record?.certificateStorageKey || !record.certificateName) throw notFound('Calibration certificate');
  return { storageKey: record.certificateStorageKey, name: record.certificateName };
}

/** The bench-file gate: a reading day is covered when some record covers it. Answers the refusal, or null. */
export async function calibrationRefusal(instrument: Instrument, day: string, transaction?: Transaction): Promise<string | null> {
  const records = await InstrumentCalibration.findAll({ where: { instrumentId: instrument.id }, attributes: ['id', 'calibratedOn', 'dueOn'], transaction });
  const coverage = coverageOn(records, day);
  if (coverage.covering) return null;
  const named = coverage.nearest ? ` (calibrated ${coverage.nearest.calibratedOn}, due ${coverage.nearest.dueOn})` : ' (no calibration recorded)';
  return `Instrument ${instrument.code} was not in calibration on ${day}${named}: its readings are refused`;
}

export type CalibrationDue = {
  instrumentId: number;
  code: string;
  kind: string;
  calibrationId: number;
  calibratedOn: string;
  dueOn: string;
  /** Days from today to the due date; negative once lapsed. */
  daysLeft: number;
};

/**
 * Instruments in use whose newest calibration is due within `withinDays` days (lapsed ones
 * included, with negative days), soonest first: for reminders and the quality dashboard.
 */
export function calibrationsDue(withinDays: number, today: string = todayUtc(), transaction?: Transaction): Promise<CalibrationDue[]> {
  return sequelize.query<CalibrationDue>(
    `SELECT i.id AS "instrumentId", i.code, i.kind, c.id AS "calibrationId", c.calibrated_on::text AS "calibratedOn", c.due_on::text AS "dueOn",
            c.due_on - CAST(:today AS date) AS "daysLeft"
       FROM instruments i
       CROSS JOIN LATERAL (SELECT id, calibrated_on, due_on FROM instrument_calibrations
                            WHERE instrument_id = i.id ORDER BY calibrated_on DESC, id DESC LIMIT 1) c
      WHERE i.active AND c.due_on <= CAST(:today AS date) + CAST(:within AS integer)
      ORDER BY c.due_on, i.code`,
    { type: QueryTypes.SELECT, replacements: { today, within: withinDays }, transaction },
  );
}

export type CalibrationUsed = { code: string; uncertaintyWaves: number; uncertaintyDeg: number; calibratedOn: string; dueOn: string };

/**
 * The calibrations the readings of these bench files were taken under: for each file, the record
 * that covered its day (its `# date:`, else the day it was uploaded), once per instrument and record.
 */
export async function calibrationsOfFiles(fileIds: number[], transaction?: Transaction): Promise<CalibrationUsed[]> {
  if (fileIds.length === 0) return [];
  const rows = await sequelize.query<CalibrationUsed & { uncertaintyWaves: string; uncertaintyDeg: string }>(
    `SELECT DISTINCT i.code, i.uncertainty_waves AS "uncertaintyWaves", i.uncertainty_deg AS "uncertaintyDeg",
            c.calibrated_on::text AS "calibratedOn", c.due_on::text AS "dueOn"
       FROM measurement_files mf
       JOIN instruments i ON i.id = mf.instrument_id
       CROSS JOIN LATERAL (SELECT coalesce((mf.metadata->>'date')::date, (mf.uploaded_at AT TIME ZONE 'UTC')::date) AS day) d
       CROSS JOIN LATERAL (SELECT calibrated_on, due_on FROM instrument_calibrations
                            WHERE instrument_id = mf.instrument_id AND calibrated_on <= d.day AND d.day <= due_on
                            ORDER BY calibrated_on DESC, id DESC LIMIT 1) c
      WHERE mf.id IN (:fileIds)
      ORDER BY i.code, "calibratedOn"`,
    { type: QueryTypes.SELECT, replacements: { fileIds }, transaction },
  );
  return rows.map((r) => ({ ...r, uncertaintyWaves: Number(r.uncertaintyWaves), uncertaintyDeg: Number(r.uncertaintyDeg) }));
}
