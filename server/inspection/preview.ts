// The check of bench files before they are saved (the preview): every row through the engine,
// nothing written to the database. It answers a summary of each file (its results counted by
// verdict, and the first page of its results, errors and warnings) and what saving the files would
// do to the lot's sampling decision; the rest of each list comes a page at a time, so a file of
// 20,000 pieces is not sent whole.
//
// Pages: a checked file is kept in the file store under its SHA-256 (the hourly sweep deletes it
// unless a commit names it), and its lists in this process for a few minutes. A page is cut from
// those lists, or, asked of another server process or later, from the stored file checked again: any
// process answers any page, and none needs to have checked the file itself.
import { inTransaction } from '../../db';
import type { LineMessage, PieceResult } from '../../shared/optics';
import {
  PREVIEW_PAGE_SIZE,
  type FilePreview,
  type MeasurementPreview,
  type PlanEffect,
  type PreviewList,
  type PreviewPiece,
  type SampleStanding,
} from '../../shared/schemas/inspection';
import { AppError, badRequest } from '../http/errors';
import { blobStore, readBlob, storeBlob } from '../storage/blobs';
import { lotProposal } from './evaluation';
import { lotForInspection, type LotForInspection } from './lotAccess';
import { analyseFile, cannotBeSaved, openLot, type CheckedFile, type UploadedFile } from './measurements';
import { inspectionPlanOf } from './sampling';
import { piecesLeftToSort } from './sort';

/** A checked file's lists, as its pages are cut from them. */
type Lists = { pieces: PreviewPiece[]; errors: LineMessage[]; warnings: LineMessage[] };

const previewPiece = (p: PieceResult): PreviewPiece => ({
  serial: p.serial,
  wavelengthNm: p.wavelengthNm,
  retardanceWaves: p.retardanceWaves,
  retardanceErrorWaves: p.retardanceErrorWaves,
  axisErrorDeg: p.axisErrorDeg,
  verdict: p.verdict,
  reasons: p.reasons,
  judged: p.judged,
  lines: p.lines,
});

const listsOf = (checked: CheckedFile): Lists => ({ pieces: checked.pieces.map(previewPiece), errors: checked.errors, warnings: checked.warnings });

/** How long a checked file's lists are kept in this process, and how many results at most in all. */
const KEEP_MS = 10 * 60_000;
const KEEP_RESULTS = 100_000;

/** Lists kept by lot, file and chosen instrument (which may decide how the file is judged); oldest first. */
const kept = new Map<string, { lists: Lists; until: number }>();
const keyOf = (lotId: number, sha256: string, instrumentId: number | undefined) => `${lotId}/${sha256}/${instrumentId ?? ''}`;

function keep(key: string, lists: Lists) {
  kept.delete(key);
  kept.set(key, { lists, until: Date.now() + KEEP_MS });
  let total = 0;
  for (const entry of kept.values()) total += entry.lists.pieces.length + entry.lists.errors.length;
  for (const [oldest, entry] of kept) {
    if (entry.until > Date.now() && total <= KEEP_RESULTS) break;
    kept.delete(oldest);
    total -= entry.lists.pieces.length + entry.lists.errors.length;
  }
}

function recall(key: string): Lists | undefined {
  const entry = kept.get(key);
  if (entry && entry.until > Date.now()) return entry.lists;
  kept.delete(key);
  return undefined;
}

function summaryOf(checked: CheckedFile, lists: Lists): FilePreview {
  const counts = { pieces: checked.pieces.length, pass: 0, fail: 0, incomplete: 0, errors: checked.errors.length, warnings: checked.warnings.length };
  for (const piece of checked.pieces) counts[piece.verdict]++;
  const { pieces: _all, errors: _errors, warnings: _warnings, ...file } = checked;
  return {
    ...file,
    counts,
    pieces: lists.pieces.slice(0, PREVIEW_PAGE_SIZE),
    errors: lists.errors.slice(0, PREVIEW_PAGE_SIZE),
    warnings: lists.warnings.slice(0, PREVIEW_PAGE_SIZE),
  };
}

const standing = ({ measured, defectives, proposal, explanation }: SampleStanding): SampleStanding => ({ measured, defectives, proposal, explanation });

/** What saving the files (all of them, in order: a later one's result replaces an earlier one's) would do to the lot's decision. */
async function planEffectOf(lot: LotForInspection, files: CheckedFile[]): Promise<PlanEffect | null> {
  const plan = await inspectionPlanOf(lot.id);
  if (!plan) return null;
  const pieceIdBySerial = new Map(lot.pieces.map((p) => [p.serial, p.id]));
  const incoming = files.flatMap((f) =>
    f.pieces.map((p) => ({ pieceId: pieceIdBySerial.get(p.serial)!, wavelengthNm: p.wavelengthNm, verdict: p.verdict, judged: p.judged })),
  );
  const after = await lotProposal(lot, undefined, incoming);
  const { now } = after;
  const measured = new Set(incoming.map((r) => r.pieceId));
  const samplePieces = [...measured].filter((id) => after.sampleIds.has(id)).length;
  return {
    plan: { sampleSize: plan.sampleSize, accept: plan.acceptNumber, reject: plan.rejectNumber },
    now: standing(now.verdict),
    afterSaving: standing(after.verdict),
    samplePieces,
    otherPieces: measured.size - samplePieces,
    replacing: after.replaced,
    sortRemaining: lot.state === 'sorting' ? { now: piecesLeftToSort(lot, now).length, afterSaving: piecesLeftToSort(lot, after).length } : null,
  };
}

/** Checks the files for the lot: a summary of each, and the plan effect when all of them could be saved. */
export async function previewMeasurements(lotId: number, files: UploadedFile[], instrumentId?: number): Promise<MeasurementPreview> {
  if (files.length === 0) throw badRequest('Attach at least one measurement file');
  const lot = openLot(await lotForInspection(lotId));
  const checked: CheckedFile[] = [];
  const previews: FilePreview[] = [];
  for (const file of files) {
    const one = await analyseFile(file, lot, instrumentId);
    const lists = listsOf(one);
    // A file refused whole has no lists to page through.
    if (!one.fatal) {
      await inTransaction((transaction) => storeBlob(file.buffer, transaction));
      keep(keyOf(lot.id, one.sha256, instrumentId), lists);
    }
    checked.push(one);
    previews.push(summaryOf(one, lists));
  }
  return { files: previews, planEffect: checked.some(cannotBeSaved) ? null : await planEffectOf(lot, checked) };
}

/** One page of a checked file's list (pieces optionally of one verdict), as `{data, total}`. */
export async function previewPage(
  lotId: number,
  sha256: string,
  list: PreviewList,
  query: { page: number; pageSize: number; instrumentId?: number; verdict?: PreviewPiece['verdict'] },
) {
  const key = keyOf(lotId, sha256, query.instrumentId);
  let lists = recall(key);
  if (!lists) {
    const lot = openLot(await lotForInspection(lotId));
    if (!(await blobStore.has(sha256))) {
      throw new AppError(404, 'preview_expired', 'This file is no longer held for its preview: check the file again');
    }
    const checked = await analyseFile({ originalname: '', buffer: await readBlob(sha256) }, lot, query.instrumentId);
    lists = listsOf(checked);
    keep(key, lists);
  }
  const entries: (PreviewPiece | LineMessage)[] = list === 'pieces' && query.verdict ? lists.pieces.filter((p) => p.verdict === query.verdict) : lists[list];
  const start = (query.page - 1) * query.pageSize;
  return { data: entries.slice(start, start + query.pageSize), total: entries.length };
}
