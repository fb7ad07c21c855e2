// Bench files for a lot: preview (every row through the engine, nothing saved) and commit (the raw
// file with its SHA-256, its readings and the per-piece results in one transaction; a new result
// for a piece supersedes the old one, which stays in the history).
import type { Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Instrument, MeasurementFile, PieceResult, Reading } from '../../db/models';
import { analyzeText, decodeBenchFile, readMetadata, type AnalysisResult, type ParsedRow } from '../../shared/optics';
import type { FilePreview } from '../../shared/schemas/inspection';
import { DECIDED_LOT_STATES, LOT_STATE_LABELS, lotName, type LotState } from '../../shared/schemas/stock';
import { recordAudit, type AuditActor } from '../audit/record';
import { AppError, badRequest } from '../http/errors';
import { sha256, storeBlob } from '../storage/blobs';
import { lotForInspection, markLotInspected, type LotForInspection } from './lotAccess';
import { evaluateLot } from './evaluation';
import { completeSortWhenMeasured } from './sort';
import { pieceSpecFor } from './spec';

export const MAX_MEASUREMENT_BYTES = 50 * 1024 * 1024;

export type UploadedFile = { originalname: string; buffer: Buffer };

function openLot(lot: LotForInspection) {
  const state = lot.state as LotState;
  if (DECIDED_LOT_STATES.includes(state)) {
    throw new AppError(409, 'lot_decided', `Lot ${lotName(lot.id)} is already decided (${LOT_STATE_LABELS[state].toLowerCase()}); its measurements are closed`);
  }
  return lot;
}

const today = () => new Date().toISOString().slice(0, 10);

type Metadata = ReturnType<typeof readMetadata>;

/**
 * The instrument a file was measured on: the one its `# instrument:` line names, else the one chosen.
 * The file's line governs: a different choice in the form is refused, never used instead.
 */
async function resolveInstrument({ metadata, lines }: Metadata, chosenId: number | undefined, transaction?: Transaction) {
  if (metadata.instrument) {
    const at = `line ${lines.instrument}`;
    const named = await Instrument.findOne({ where: { code: metadata.instrument }, transaction });
    if (!named) return { problem: `${at}: the file names instrument "${metadata.instrument}", which is not in the register` };
    if (chosenId && named.id !== chosenId) {
      const chosen = await Instrument.findByPk(chosenId, { transaction });
      return { problem: `${at}: the file was measured on ${named.code}, not on ${chosen?.code ?? 'the instrument'} chosen for the upload; the instrument the file names is the one that counts` };
    }
    return { instrument: named };
  }
  if (!chosenId) return { problem: 'The file has no "# instrument:" line: choose the instrument it was measured on' };
  const chosen = await Instrument.findByPk(chosenId, { transaction });
  return chosen ? { instrument: chosen } : { problem: 'The chosen instrument does not exist' };
}

/** The day the file was measured (its `# date:` line, else today), or why that line cannot be used. */
function measuredOn({ metadata, lines }: Metadata): { day: string } | { problem: string } {
  const day = metadata.date;
  if (day === undefined) return { day: today() };
  const parsed = /^\d{4}-\d{2}-\d{2}$/.test(day) ? new Date(`${day}T00:00:00Z`) : null;
  if (!parsed || Number.isNaN(parsed.getTime()) || parsed.toISOString().slice(0, 10) !== day) {
    return { problem: `line ${lines.date}: the date ${JSON.stringify(day)} is not a date (expected YYYY-MM-DD)` };
  }
  if (day > today()) return { problem: `line ${lines.date}: the date ${day} is in the future` };
  return { day };
}

/** A file's preview, and the rows the engine read, which a commit stores as the file's readings. */
type AnalysedFile = { preview: FilePreview; columns: string[]; rows: ParsedRow[] };

async function analyseFile(file: UploadedFile, lot: LotForInspection, chosenInstrumentId: number | undefined, transaction?: Transaction): Promise<AnalysedFile> {
  const base = { name: file.originalname, sha256: sha256(file.buffer), sizeBytes: file.buffer.length };
  const refused = (fatal: string, metadata: AnalysisResult['metadata'], instrument: FilePreview['instrument'] = null): AnalysedFile => ({
    preview: { ...base, method: null, metadata, instrument, pieces: [], warnings: [], errors: [], fatal },
    columns: [],
    rows: [],
  });
  // Decoded once (byte-order mark dropped, CRLF and CR line ends made LF): the `#` lines read here
  // and the rows the engine reads are lines of the same text.
  const decoded = decodeBenchFile(file.buffer, MAX_MEASUREMENT_BYTES);
  if ('fatal' in decoded) return refused(decoded.fatal, {});
  const { text } = decoded;
  // The instrument's profile and uncertainty shape the analysis, so its `#` lines are read first
  // and the rows are analysed once. A file that is not readable at all says so before anything else.
  const metadata = readMetadata(text);
  const unreadable = () => analyzeText(text, pieceSpecFor(lot.spec), { maxBytes: MAX_MEASUREMENT_BYTES }).fatal;
  const found = await resolveInstrument(metadata, chosenInstrumentId, transaction);
  if (!found.instrument) return refused(unreadable() ?? found.problem, metadata.metadata);
  const instrument = found.instrument;
  const used = { id: instrument.id, code: instrument.code };
  const day = measuredOn(metadata);
  if ('problem' in day) return refused(unreadable() ?? day.problem, metadata.metadata, used);
  if (!instrument.isCalibratedOn(day.day)) {
    return refused(
      `Instrument ${instrument.code} was not in calibration on ${day.day} (calibrated ${instrument.calibratedOn}, due ${instrument.calibrationDueOn}): its readings are refused`,
      metadata.metadata,
      used,
    );
  }
  const result = analyzeText(text, pieceSpecFor(lot.spec, instrument), { maxBytes: MAX_MEASUREMENT_BYTES, keepRows: true });
  const serials = new Set(lot.pieces.map((p) => p.serial));
  const strangers = result.pieces.filter((p) => !serials.has(p.serial));
  const errors = [
    ...result.errors,
    ...strangers.flatMap((p) => p.lines.map((line) => ({ line, message: `Serial ${p.serial} is not in lot ${lotName(lot.id)}` }))),
  ].sort((a, b) => a.line - b.line);
  return {
    preview: {
      ...base,
      method: result.method,
      metadata: result.metadata,
      instrument: used,
      pieces: result.pieces.filter((p) => serials.has(p.serial)),
      warnings: result.warnings,
      errors,
      fatal: result.fatal,
    },
    columns: result.columns,
    rows: result.rows,
  };
}

export async function previewMeasurements(lotId: number, files: UploadedFile[], instrumentId?: number) {
  if (files.length === 0) throw badRequest('Attach at least one measurement file');
  const lot = openLot(await lotForInspection(lotId));
  return { files: await Promise.all(files.map(async (f) => (await analyseFile(f, lot, instrumentId)).preview)) };
}

/** A row as the readings table keeps it: its cells by column name, trimmed (the first of a repeated name). */
function readingOf({ line, serial, wavelengthNm, cells }: ParsedRow, columns: string[]) {
  const fields: Record<string, string> = {};
  columns.forEach((name, index) => {
    if (name !== '' && !(name in fields)) fields[name] = (cells[index] ?? '').trim();
  });
  return { line, serial, wavelengthNm, fields };
}

export function commitMeasurements(actor: AuditActor & { id: number }, lotId: number, files: UploadedFile[], instrumentId?: number) {
  if (files.length === 0) throw badRequest('Attach at least one measurement file');
  return inTransaction(async (transaction) => {
    const lot = openLot(await lotForInspection(lotId, transaction, { lock: true }));
    const analysed = await Promise.all(files.map((f) => analyseFile(f, lot, instrumentId, transaction)));
    const previews = analysed.map((a) => a.preview);
    const refused = previews.filter((p) => p.fatal || p.errors.length);
    if (refused.length) {
      throw new AppError(422, 'measurement_errors', 'Nothing was saved: fix the errors in the file(s) and upload again', refused.map((p) => ({ name: p.name, fatal: p.fatal, errors: p.errors })));
    }
    const pieceIdBySerial = new Map(lot.pieces.map((p) => [p.serial, p.id]));
    const committed = [];
    for (const [index, preview] of previews.entries()) {
      const buffer = files[index].buffer;
      const stored = await MeasurementFile.create(
        {
          lotId, instrumentId: preview.instrument!.id, originalName: preview.name, sha256: preview.sha256, sizeBytes: preview.sizeBytes,
          method: preview.method!, metadata: preview.metadata as Record<string, string>, rowCount: 0, warnings: preview.warnings,
          storageKey: await storeBlob(buffer, transaction), uploadedBy: actor.id,
        },
        { transaction },
      );
      const { columns, rows } = analysed[index];
      await Reading.bulkCreate(rows.map((row) => ({ ...readingOf(row, columns), fileId: stored.id })), { transaction });
      stored.rowCount = rows.length;
      await stored.save({ transaction });
      // The new file's results replace the current ones of the same pieces at the same wavelengths.
      if (preview.pieces.length) await sequelize.query(
        `UPDATE piece_results r SET superseded_by_file_id = :fileId
         FROM unnest(ARRAY[:pieceIds]::int[], ARRAY[:wavelengths]::numeric[]) AS measured(piece_id, wavelength_nm)
         WHERE r.piece_id = measured.piece_id AND r.wavelength_nm = measured.wavelength_nm AND r.superseded_by_file_id IS NULL`,
        {
          transaction,
          replacements: {
            fileId: stored.id,
            pieceIds: preview.pieces.map((piece) => pieceIdBySerial.get(piece.serial)!),
            wavelengths: preview.pieces.map((piece) => piece.wavelengthNm),
          },
        },
      );
      await PieceResult.bulkCreate(
        preview.pieces.map((piece) => ({
          pieceId: pieceIdBySerial.get(piece.serial)!, fileId: stored.id, wavelengthNm: piece.wavelengthNm, verdict: piece.verdict, result: { ...piece },
        })),
        { transaction },
      );
      await recordAudit(
        actor,
        { action: 'measurement.upload', entityType: 'lot', entityId: lotId, after: { fileId: stored.id, name: preview.name, sha256: preview.sha256, pieces: preview.pieces.length, instrument: preview.instrument!.code } },
        transaction,
      );
      committed.push({ fileId: stored.id, name: preview.name, sha256: preview.sha256, pieces: preview.pieces.length, rows: rows.length });
    }
    const evaluation = await evaluateLot(lot, transaction);
    await markLotInspected(lot, evaluation.verdict.proposal !== 'undecided', transaction);
    // The file that measures the last piece of a sort completes it, in this same transaction.
    const sortCompleted = lot.state === 'sorting' ? await completeSortWhenMeasured(lot, evaluation, actor, transaction) : null;
    return { files: committed, sortCompleted };
  });
}
