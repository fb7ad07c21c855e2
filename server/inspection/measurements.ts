// Bench files for a lot: the check of a file (every row through the engine; preview.ts answers it)
// and the commit (the raw file with its SHA-256, its readings and the per-piece results in one
// transaction; a new result for a piece supersedes the old one, which stays in the history).
import type { Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { CopyText, copyCell, copyRows, openCopy, type CopySink } from '../../db/copy';
import { Instrument, MeasurementFile } from '../../db/models';
import {
  analyzeStream,
  analyzeText,
  decodeBenchFile,
  readMetadata,
  type AnalysisResult,
  type FileMetadata,
  type LineMessage,
  type Method,
  type ParsedRow,
  type PieceResult,
} from '../../shared/optics';
import { DECIDED_LOT_STATES, LOT_STATE_LABELS, lotName, type LotState } from '../../shared/schemas/stock';
import { recordAudit, type AuditActor } from '../audit/record';
import { calibrationRefusal } from '../instruments/calibrations';
import { AppError, badRequest } from '../http/errors';
import { enqueue, QUEUES } from '../jobs/queue';
import { sha256, storeBlob } from '../storage/blobs';
import { lotForInspection, markLotInspected, type LotForInspection } from './lotAccess';
import { evaluateLot, lotProposal } from './evaluation';
import { completeSortWhenMeasured, piecesLeftToSort } from './sort';
import { pieceSpecFor } from './spec';

export const MAX_MEASUREMENT_BYTES = 50 * 1024 * 1024;

export type UploadedFile = { originalname: string; buffer: Buffer };

export function openLot(lot: LotForInspection) {
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
      return {
        problem: `${at}: the file was measured on ${named.code}, not on ${chosen?.code ?? 'the instrument'} chosen for the upload; the instrument the file names is the one that counts`,
      };
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

/** A file checked for the lot: what a commit of it would store, or why it cannot be. */
export type CheckedFile = {
  name: string;
  sha256: string;
  sizeBytes: number;
  method: Method | null;
  metadata: FileMetadata;
  /** The instrument the file was judged with (the one its `# instrument:` line names, else the one chosen). */
  instrument: { id: number; code: string } | null;
  /** The lot's pieces in the file; rows of serials not in the lot are among the errors. */
  pieces: PieceResult[];
  warnings: LineMessage[];
  errors: LineMessage[];
  fatal?: string;
};

type Prepared = {
  base: Pick<CheckedFile, 'name' | 'sha256' | 'sizeBytes'>;
  /** The file's text as every reader sees it (no byte-order mark, LF line ends). */
  text: string;
  instrument: Instrument;
  used: { id: number; code: string };
};

/**
 * A file before its rows are read: refused already (not text; an instrument unknown, contradicted or
 * out of calibration; a bad date), or ready for the engine with the instrument that shapes the analysis.
 */
async function prepareFile(
  file: UploadedFile,
  lot: LotForInspection,
  chosenInstrumentId: number | undefined,
  transaction?: Transaction,
): Promise<{ refused: CheckedFile } | Prepared> {
  const base = { name: file.originalname, sha256: sha256(file.buffer), sizeBytes: file.buffer.length };
  const refused = (fatal: string, metadata: AnalysisResult['metadata'], instrument: CheckedFile['instrument'] = null) => ({
    refused: { ...base, method: null, metadata, instrument, pieces: [], warnings: [], errors: [], fatal },
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
  const outOfCalibration = await calibrationRefusal(instrument, day.day, transaction);
  if (outOfCalibration) return refused(outOfCalibration, metadata.metadata, used);
  return { base, text, instrument, used };
}

/** The engine's result for the lot: its pieces, and rows of serials not in the lot among the errors. */
function checkedOf({ base, used }: Prepared, lot: LotForInspection, result: AnalysisResult): CheckedFile {
  const serials = new Set(lot.pieces.map((p) => p.serial));
  const strangers = result.pieces.filter((p) => !serials.has(p.serial));
  const errors = [
    ...result.errors,
    ...strangers.flatMap((p) => p.lines.map((line) => ({ line, message: `Serial ${p.serial} is not in lot ${lotName(lot.id)}` }))),
  ].sort((a, b) => a.line - b.line);
  return {
    ...base,
    method: result.method,
    metadata: result.metadata,
    instrument: used,
    pieces: result.pieces.filter((p) => serials.has(p.serial)),
    warnings: result.warnings,
    errors,
    fatal: result.fatal,
  };
}

/** Checks a file for the lot, writing nothing. */
export async function analyseFile(
  file: UploadedFile,
  lot: LotForInspection,
  chosenInstrumentId: number | undefined,
  transaction?: Transaction,
): Promise<CheckedFile> {
  const prepared = await prepareFile(file, lot, chosenInstrumentId, transaction);
  if ('refused' in prepared) return prepared.refused;
  return checkedOf(prepared, lot, analyzeText(prepared.text, pieceSpecFor(lot.spec, prepared.instrument), { maxBytes: MAX_MEASUREMENT_BYTES }));
}

/**
 * A file's readings as COPY rows of the readings table, written as the engine reads them: file,
 * line, serial, wavelength and the row's cells by column name as JSON (trimmed; the first of a
 * repeated name).
 */
class ReadingsCopy {
  private readonly text = new CopyText();
  /** Index of each named column (first of a repeated name) and the JSON text before its value, from the header. */
  private named: { index: number; key: string }[] | null = null;

  constructor(
    private readonly fileId: number,
    private readonly sink: CopySink,
  ) {}

  get rows() {
    return this.text.rows;
  }

  add = ({ line, serial, wavelengthNm, cells }: ParsedRow, columns: readonly string[]) => {
    this.named ??= columns
      .flatMap((name, index) => (name !== '' && columns.indexOf(name) === index ? [{ index, name }] : []))
      .map(({ index, name }, k) => ({ index, key: `${k === 0 ? '{' : ','}${JSON.stringify(name)}:` }));
    // The object's text is assembled from its keys written once, not built and stringified per row;
    // a cell with nothing to escape (the usual number or code) is quoted as it is.
    let fields = this.named.length === 0 ? '{' : '';
    let plain = true;
    for (const { index, key } of this.named) {
      const cell = (cells[index] ?? '').trim();
      if (plain && NEEDS_ESCAPE.test(cell)) plain = false;
      fields += key + (plain ? `"${cell}"` : JSON.stringify(cell));
    }
    // Only an escaped cell puts a backslash (or a control character) in the text COPY reads.
    const piece = this.text.add(`${this.fileId}\t${line}\t${copyCell(serial)}\t${wavelengthNm}\t${plain ? `${fields}}` : copyCell(`${fields}}`)}`);
    if (piece) this.sink.write(piece);
  };

  finish() {
    const piece = this.text.finish();
    if (piece) this.sink.write(piece);
  }
}

/** What JSON escapes in a string: a quote, a backslash, a control character. */
// eslint-disable-next-line no-control-regex -- control characters are exactly what must be found
const NEEDS_ESCAPE = /["\\\u0000-\u001f]/;

/** Bytes of a file handed to the engine at a time. */
const PIECE_BYTES = 1 << 18;

/**
 * The file's bytes a piece at a time, each once the readings written so far may wait to be sent:
 * PostgreSQL writes the rows of one piece while the engine reads the next. Stops early when the
 * COPY has failed (its error is answered when it ends).
 */
async function* inPieces(bytes: Uint8Array, sink: CopySink) {
  for (let at = 0; at < bytes.length && !sink.failed; at += PIECE_BYTES) {
    await sink.ready();
    yield bytes.subarray(at, at + PIECE_BYTES);
  }
}

/** The file's results as COPY rows of piece_results: piece, file, wavelength, verdict and the engine's result. */
function* resultRows(fileId: number, pieces: readonly PieceResult[], pieceIdBySerial: Map<string, number>): Generator<string> {
  for (const piece of pieces) {
    yield `${pieceIdBySerial.get(piece.serial)}\t${fileId}\t${piece.wavelengthNm}\t${piece.verdict}\t${copyCell(JSON.stringify(piece))}`;
  }
}

/**
 * Checks one file and saves it in the caller's transaction: the raw bytes in the file store, its
 * row, its readings and its results (superseding the current results of the same pieces and
 * wavelengths). The readings go by COPY while the engine reads the rows, the results by COPY after,
 * and nothing is read back, so a file of 100,000 rows costs about what it takes to read it and to
 * write them. A file the check refuses answers why, and its transaction must not commit.
 */
async function checkAndSave(
  actor: AuditActor & { id: number },
  lot: LotForInspection,
  file: UploadedFile,
  instrumentId: number | undefined,
  transaction: Transaction,
) {
  const prepared = await prepareFile(file, lot, instrumentId, transaction);
  if ('refused' in prepared) return prepared;
  const { base, used } = prepared;
  // The file's row first (its method and counts are filled in once its rows are read), so that the
  // readings that name it can be written while they are read.
  const stored = await MeasurementFile.create(
    {
      lotId: lot.id,
      instrumentId: used.id,
      originalName: base.name,
      sha256: base.sha256,
      sizeBytes: base.sizeBytes,
      method: '',
      metadata: {},
      rowCount: 0,
      warnings: [],
      storageKey: await storeBlob(file.buffer, transaction),
      uploadedBy: actor.id,
    },
    { transaction },
  );
  const sink = openCopy(transaction, 'readings', ['file_id', 'line', 'serial', 'wavelength_nm', 'fields']);
  const readings = new ReadingsCopy(stored.id, sink);
  const result = await analyzeStream(inPieces(file.buffer, sink), pieceSpecFor(lot.spec, prepared.instrument), {
    maxBytes: MAX_MEASUREMENT_BYTES,
    onRow: readings.add,
  });
  readings.finish();
  await sink.end();
  const checked = checkedOf(prepared, lot, result);
  if (cannotBeSaved(checked)) return { refused: checked };

  const { pieces } = checked;
  await stored.update(
    { method: checked.method!, metadata: checked.metadata as Record<string, string>, rowCount: readings.rows, warnings: checked.warnings },
    { transaction },
  );
  const pieceIdBySerial = new Map(lot.pieces.map((p) => [p.serial, p.id]));
  // The new file's results replace the current ones of the same pieces at the same wavelengths
  // (compared as the table stores wavelengths, to 0.001 nm). Each is looked up in the index of
  // current results by its piece and wavelength (LIMIT 1: there is at most one, and the planner
  // keeps the lookup instead of scanning the whole table), whatever the size of the table.
  if (pieces.length)
    await sequelize.query(
      `UPDATE piece_results SET superseded_by_file_id = $1
      WHERE id = ANY (ARRAY(
        SELECT current.id FROM unnest($2::int[], $3::numeric(9, 3)[]) AS measured(piece_id, wavelength_nm)
        CROSS JOIN LATERAL (SELECT r.id FROM piece_results r
                             WHERE r.piece_id = measured.piece_id AND r.wavelength_nm = measured.wavelength_nm AND r.superseded_by_file_id IS NULL LIMIT 1) current))`,
      { transaction, bind: [stored.id, pieces.map((piece) => pieceIdBySerial.get(piece.serial)!), pieces.map((piece) => piece.wavelengthNm)] },
    );
  await copyRows(transaction, 'piece_results', ['piece_id', 'file_id', 'wavelength_nm', 'verdict', 'result'], resultRows(stored.id, pieces, pieceIdBySerial));
  await recordAudit(
    actor,
    {
      action: 'measurement.upload',
      entityType: 'lot',
      entityId: lot.id,
      after: { fileId: stored.id, name: checked.name, sha256: checked.sha256, pieces: pieces.length, instrument: used.code },
    },
    transaction,
  );
  return { saved: { fileId: stored.id, name: checked.name, sha256: checked.sha256, pieces: pieces.length, rows: readings.rows } };
}

/** A file with an error is refused whole: nothing of it may be saved. */
export const cannotBeSaved = (checked: CheckedFile) => Boolean(checked.fatal || checked.errors.length);

export function commitMeasurements(actor: AuditActor & { id: number }, lotId: number, files: UploadedFile[], instrumentId?: number) {
  if (files.length === 0) throw badRequest('Attach at least one measurement file');
  return inTransaction(async (transaction) => {
    const lot = openLot(await lotForInspection(lotId, transaction, { lock: true }));
    // Every file is checked, so that a refusal names all the files at fault; one refused file
    // leaves the transaction to roll back, the others with it.
    const committed = [];
    const refused: CheckedFile[] = [];
    for (const file of files) {
      const outcome = await checkAndSave(actor, lot, file, instrumentId, transaction);
      if ('refused' in outcome) refused.push(outcome.refused);
      else committed.push(outcome.saved);
    }
    if (refused.length) {
      throw new AppError(
        422,
        'measurement_errors',
        'Nothing was saved: fix the errors in the file(s) and upload again',
        refused.map((p) => ({ name: p.name, fatal: p.fatal, errors: p.errors })),
      );
    }
    // The supplier's drift check reads the new results as soon as they are committed.
    await enqueue(QUEUES.supplierDriftCheck, { lotId }, transaction);
    // The proposal needs only the verdicts; a sort may complete, and its documents need the results.
    const proposal = await lotProposal(lot, transaction);
    await markLotInspected(lot, proposal.verdict.proposal !== 'undecided', transaction);
    // The file that measures the last piece of a sort completes it, in this same transaction.
    const sortCompleted =
      lot.state === 'sorting' && piecesLeftToSort(lot, proposal).length === 0
        ? await completeSortWhenMeasured(lot, await evaluateLot(lot, transaction), actor, transaction)
        : null;
    return { files: committed, sortCompleted };
  });
}
