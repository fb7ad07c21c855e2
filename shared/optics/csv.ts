/**
 * CSV reading with csv-parse, feeding a ReadingCollector record by record with source line numbers.
 * `#` lines are comments to csv-parse; they are read here on the side for the metadata. Both paths
 * read normalised text (text.ts: no byte-order mark, LF line ends), so they see the same lines.
 */
import { once } from 'node:events';
import { CsvError, Parser, type Options } from 'csv-parse';
import { parse as parseSync } from 'csv-parse/sync';
import type { ReadingCollector } from './readings.js';
import { lineEndNormalizer } from './text.js';

/** The csv-parse options of the engine (the benchmark times csv-parse alone with these too). */
export const CSV_OPTIONS: Options = {
  comment: '#',
  comment_no_infix: true,
  skip_empty_lines: true,
  relax_column_count: true,
  relax_quotes: true,
  skip_records_with_error: true,
};

const skipMessage = (error: CsvError) => `the CSV could not be read here: ${error.message}`;

/** Text is parsed in slices of about this many characters, cut at line ends, so records die young. */
const SLICE_CHARS = 1 << 20;

interface Slice {
  start: number;
  end: number;
  firstLine: number;
  /** Source lines of the records in this slice, when every record is one line. */
  recordLines: number[];
}

/**
 * Reads a whole normalised text (normalizeText). Its `#` lines go to the collector first; then csv-parse reads it slice by
 * slice. Line numbers come from the text's own lines when every record is one line (every line's
 * quotes balance and the record count agrees); otherwise csv-parse is asked for them, which costs
 * it about twice the time.
 */
export function collectText(text: string, collector: ReadingCollector, maxRows: number): void {
  const checkQuotes = text.includes('"');
  let quotesBalance = true;
  let recordCount = 0;
  const slices: Slice[] = [{ start: 0, end: text.length, firstLine: 1, recordLines: [] }];
  let line = 0;
  for (let start = 0; start < text.length; ) {
    let end = text.indexOf('\n', start);
    if (end === -1) end = text.length;
    line++;
    const first = text.charCodeAt(start);
    if (first === 35 /* # */) {
      collector.comment(line, text.slice(start, end));
    } else if (end > start) {
      slices[slices.length - 1].recordLines.push(line);
      recordCount++;
      if (checkQuotes && quotesBalance) quotesBalance = text.slice(start, end).split('"').length % 2 === 1;
    }
    start = end + 1;
    const current = slices[slices.length - 1];
    if (start - current.start >= SLICE_CHARS && start < text.length) {
      current.end = start;
      slices.push({ start, end: text.length, firstLine: line + 1, recordLines: [] });
    }
  }
  // The header is one of the records.
  if (recordCount - 1 > maxRows) {
    collector.fail(`the file has more than ${maxRows} data rows; split it into smaller files`);
    return;
  }
  // A quoted line break may cross a slice boundary: then the text is read in one piece.
  const pieces = quotesBalance ? slices : [{ start: 0, end: text.length, firstLine: 1, recordLines: [] }];
  for (const slice of pieces) {
    if (collector.failed) return;
    collectSlice(text.slice(slice.start, slice.end), slice, collector, quotesBalance);
  }
}

function collectSlice(text: string, slice: Slice, collector: ReadingCollector, linesKnown: boolean): void {
  const skipped: CsvError[] = [];
  const options: Options = { ...CSV_OPTIONS, on_skip: (error) => void skipped.push(error as CsvError) };
  if (linesKnown) {
    const records = parseSync(text, options) as string[][];
    if (skipped.length === 0 && records.length === slice.recordLines.length) {
      for (let i = 0; i < records.length && !collector.failed; i++) collector.record(records[i], slice.recordLines[i]);
      return;
    }
    skipped.length = 0;
  }
  const located = parseSync(text, { ...options, info: true }) as unknown as { record: string[]; info: { lines: number } }[];
  const offset = slice.firstLine - 1;
  for (const error of skipped) collector.recordError((Number(error.lines) || 1) + offset, skipMessage(error));
  for (const { record, info } of located) {
    if (collector.failed) break;
    collector.record(record, info.lines + offset);
  }
}

/**
 * Reads chunks as they come; stops at maxBytes. Each chunk is decoded and normalised, its comments
 * tapped, and then handed to the parser, so the parser and the tap see the same lines.
 */
export async function collectStream(
  source: AsyncIterable<Uint8Array | string>,
  collector: ReadingCollector,
  maxBytes: number,
): Promise<void> {
  const parser = new Parser({
    ...CSV_OPTIONS,
    info: true,
    on_skip: (error) =>
      void collector.recordError(Number((error as CsvError).lines) || 0, skipMessage(error as CsvError)),
  });
  const consumer = (async () => {
    for await (const { record, info } of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      collector.record(record, info.lines);
    }
  })();
  const decoder = new TextDecoder('utf-8', { fatal: true });
  const encoder = new TextEncoder();
  const normalize = lineEndNormalizer();
  let pending = '';
  let line = 0;
  const tap = (text: string, final: boolean) => {
    const parts = (pending + text).split('\n');
    pending = final ? '' : parts.pop()!;
    for (const part of parts) {
      line++;
      if (part.startsWith('#')) collector.comment(line, part);
    }
  };
  const feed = async (text: string, final: boolean) => {
    tap(text, final);
    if (text !== '' && !parser.write(text)) await once(parser, 'drain');
  };
  let bytes = 0;
  try {
    for await (const chunk of source) {
      const buffer = typeof chunk === 'string' ? encoder.encode(chunk) : chunk;
      bytes += buffer.byteLength;
      if (bytes > maxBytes) {
        collector.fail(`the file is larger than ${maxBytes} bytes`);
        break;
      }
      if (buffer.includes(0)) {
        collector.fail('the file is not text (it contains NUL bytes): expected a CSV file');
        break;
      }
      await feed(normalize(decoder.decode(buffer, { stream: true }), false), false);
    }
    if (!collector.failed) await feed(normalize(decoder.decode(), true), true);
  } catch (error) {
    collector.fail(error instanceof TypeError ? 'the file is not UTF-8 text' : `the file could not be read: ${String(error)}`);
  }
  parser.end();
  try {
    await consumer;
  } catch (error) {
    collector.fail(`the file is not CSV: ${error instanceof Error ? error.message : String(error)}`);
  }
}
