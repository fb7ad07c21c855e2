// Bench files at scale: the preview as a summary with its lists a page at a time, what it says saving
// would do to the sampling decision, and the commit's bulk writes.
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { MeasurementFile, PieceResult, Reading } from '../../../db/models';
import { as } from '../../../tests/helpers/api';
import { benchFile, sampleOf } from '../../../tests/helpers/bench';
import { receivedLot } from '../../../tests/helpers/receivedLot';

let inspector: Awaited<ReturnType<typeof as>>;
beforeAll(async () => {
  inspector = await as('inspector');
});
afterEach(() => {
  vi.useRealTimers();
});

const upload = (path: string, name: string, content: string) =>
  inspector.post(path).attach('files', Buffer.from(content), { filename: name, contentType: 'text/csv' });
const previewOf = (lotId: number, name: string, content: string) => upload(`/api/inspection/lots/${lotId}/measurements/preview`, name, content).expect(200);
const page = (lotId: number, sha256: string, list: string, query: Record<string, string | number> = {}) =>
  inspector.get(`/api/inspection/lots/${lotId}/measurements/preview/${sha256}/${list}`).query(query);

type Line = { line: number; message: string };
type Piece = { serial: string; verdict: string };

/** Every entry of a list: the first page from the preview, the others asked for one by one. */
async function wholeList<T>(lotId: number, sha256: string, list: string, first: T[], total: number, query: Record<string, string> = {}) {
  const entries = [...first];
  for (let n = 2; (n - 1) * 50 < total; n++) {
    const next = await page(lotId, sha256, list, { ...query, page: n }).expect(200);
    expect(next.body.total).toBe(total);
    entries.push(...next.body.data);
  }
  return entries;
}

describe('preview of a bench file: a summary, and each list a page at a time', () => {
  it('counts the results by verdict, sends the first 50 of each list, and every other entry on request, every error with its line', async () => {
    const lot = await receivedLot({ quantity: 120 });
    const bad = lot.serials.slice(10, 13);
    const lines = benchFile(lot.serials, bad).trimEnd().split('\n');
    // Rows 6.. are data (five lines before them): 70 of them get a cell beyond the header (a warning each),
    // and 60 rows of serials that are not in the lot follow (an error each).
    for (let i = 5; i < 75; i++) lines[i] += ',extra';
    const strangers = Array.from({ length: 60 }, (_, i) => `ZZ-${i},632.8,H,1,1,0,0,0`);
    const content = [...lines, ...strangers].join('\n');
    const strangerLines = strangers.map((_, i) => lines.length + i + 1);

    const { body } = await previewOf(lot.lotId, 'large.csv', content);
    const [file] = body.files;
    expect(file.counts).toEqual({ pieces: 120, pass: 117, fail: 3, incomplete: 0, errors: 60, warnings: 70 });
    expect([file.pieces.length, file.errors.length, file.warnings.length]).toEqual([50, 50, 50]);
    // Nothing could be saved: no plan effect to speak of.
    expect(body.planEffect).toBeNull();

    const pieces = await wholeList<Piece>(lot.lotId, file.sha256, 'pieces', file.pieces, 120);
    expect(pieces.map((p) => p.serial)).toEqual(lot.serials);
    const failed = await page(lot.lotId, file.sha256, 'pieces', { verdict: 'fail' }).expect(200);
    expect(failed.body).toEqual({ data: expect.any(Array), total: 3 });
    expect(failed.body.data.map((p: Piece) => p.serial)).toEqual(bad);

    const errors = await wholeList<Line>(lot.lotId, file.sha256, 'errors', file.errors, 60);
    expect(errors.map((e) => e.line)).toEqual(strangerLines);
    expect(errors[0].message).toBe(`Serial ZZ-0 is not in lot L-${lot.lotId}`);
    const warnings = await wholeList<Line>(lot.lotId, file.sha256, 'warnings', file.warnings, 70);
    expect(warnings.map((w) => w.line)).toEqual(Array.from({ length: 70 }, (_, i) => i + 6));

    // A page beyond the end is empty; a page size of its own is honoured.
    expect((await page(lot.lotId, file.sha256, 'pieces', { page: 9 }).expect(200)).body).toEqual({ data: [], total: 120 });
    expect((await page(lot.lotId, file.sha256, 'pieces', { page: 2, pageSize: 100 }).expect(200)).body.data).toHaveLength(20);
  });

  it('cuts a page from the stored file again once this process has let the check go; a file not held says to check it again', async () => {
    const lot = await receivedLot({ quantity: 80 });
    const { body } = await previewOf(lot.lotId, 'later.csv', benchFile(lot.serials, [lot.serials[70]]));
    const sha256 = body.files[0].sha256;
    const first = await page(lot.lotId, sha256, 'pieces', { page: 2 }).expect(200);

    // Half an hour on, the kept lists are gone; the file in the store is analysed again.
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(Date.now() + 30 * 60_000);
    const again = await page(lot.lotId, sha256, 'pieces', { page: 2 }).expect(200);
    expect(again.body).toEqual(first.body);
    expect(again.body.data.find((p: Piece) => p.serial === lot.serials[70]).verdict).toBe('fail');
    vi.useRealTimers();

    const unknown = await page(lot.lotId, 'a'.repeat(64), 'pieces').expect(404);
    expect(unknown.body.error).toMatchObject({ code: 'preview_expired', message: 'This file is no longer held for its preview: check the file again' });
    await page(lot.lotId, sha256, 'readings').expect(400);
    await page(lot.lotId, 'not-a-hash', 'pieces').expect(400);
    await page(lot.lotId, sha256, 'pieces', { verdict: 'maybe' }).expect(400);
    await (await as('quality')).get(`/api/inspection/lots/${lot.lotId}/measurements/preview/${sha256}/pieces`).expect(403);
  });

  it('says what saving would do to the sampling decision, and the commit then does just that', async () => {
    const lot = await receivedLot({ quantity: 60, level: 'II', aql: 1 });
    const { sample, view } = await sampleOf(lot.lotId);
    const others = lot.serials.filter((s) => !sample.includes(s)).slice(0, 2);
    const half = sample.slice(0, Math.floor(sample.length / 2));
    await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'first.csv', benchFile(half)).expect(201);

    // The rest of the sample with one failing plate, a plate measured again and two outside the sample.
    const rest = sample.slice(half.length);
    const second = benchFile([half[0], ...rest, ...others], [rest[0]]);
    const { body } = await previewOf(lot.lotId, 'second.csv', second);
    const effect = body.planEffect;
    expect(effect.plan).toEqual({ sampleSize: view.plan.sampleSize, accept: view.plan.accept, reject: view.plan.reject });
    expect(effect.now).toMatchObject({ measured: half.length, defectives: 0, proposal: 'undecided' });
    expect(effect.afterSaving).toMatchObject({ measured: sample.length, defectives: 1 });
    expect(effect).toMatchObject({ samplePieces: rest.length + 1, otherPieces: 2, replacing: 1, sortRemaining: null });

    await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'second.csv', second).expect(201);
    const after = (await sampleOf(lot.lotId)).view.verdict;
    expect({ measured: after.measured, defectives: after.defectives, proposal: after.proposal, explanation: after.explanation }).toEqual(effect.afterSaving);
  });
});

describe('commit of a bench file', () => {
  it('stores cells with tabs, line breaks, backslashes and quotes as they were read, and results of serials with a backslash', async () => {
    const lot = await receivedLot({ quantity: 6, serialPrefix: 'T\\B-' });
    const { sample } = await sampleOf(lot.lotId);
    const lines = benchFile(sample).trimEnd().split('\n');
    const notes = ['tab\there', 'two\nlines', 'back\\slash', 'say "hi"', '\\N'];
    lines[4] += ',note';
    for (let i = 5; i < lines.length; i++) lines[i] += `,"${notes[i % notes.length].replaceAll('"', '""')}"`;
    const committed = await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'odd.csv', lines.join('\n')).expect(201);
    const { fileId, rows } = committed.body.files[0];
    expect(rows).toBe(sample.length * 6);

    const stored = await Reading.findAll({ where: { fileId }, order: [['line', 'ASC']] });
    expect(stored.map((r) => r.fields.note)).toEqual(lines.slice(5).map((_, k) => notes[(k + 5) % notes.length]));
    expect(stored[0].serial).toBe(sample[0]);
    expect(sample[0]).toContain('\\');
    const results = await PieceResult.findAll({ where: { fileId }, order: [['id', 'ASC']] });
    expect(results.map((r) => r.result.serial)).toEqual(sample);
    expect(results.map((r) => r.verdict)).toEqual(sample.map(() => 'pass'));
  });

  it('refuses the whole upload when the database cannot hold a value, and saves nothing of it', async () => {
    const lot = await receivedLot({ quantity: 8 });
    const { sample } = await sampleOf(lot.lotId);
    // A wavelength past numeric(9, 3) on the last plate's rows (the engine reads it, not judged).
    const content = benchFile(sample).replaceAll(`${sample[sample.length - 1]},632.8,`, `${sample[sample.length - 1]},12345678.9,`);
    const before = { files: await MeasurementFile.count(), readings: await Reading.count(), results: await PieceResult.count() };
    const refused = await upload(`/api/inspection/lots/${lot.lotId}/measurements`, 'far.csv', content).expect(400);
    expect(refused.body.error).toMatchObject({ code: 'bad_value', message: 'A number is out of the range that can be stored' });
    expect({ files: await MeasurementFile.count(), readings: await Reading.count(), results: await PieceResult.count() }).toEqual(before);
    expect((await sampleOf(lot.lotId)).view.lot.state).toBe('quarantine');
  });
});
