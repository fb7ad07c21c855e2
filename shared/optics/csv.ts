/**
 * CSV reading with csv-parse, feeding a ReadingCollector record by record with source line numbers.
 * `#` lines are comments to csv-parse; they are read here on the side for the metadata. Text and
 * stream alike are normalised first (text.ts: no byte-order mark, LF line ends), cut at line ends
 * into slices and parsed slice by slice, so both see the same lines and give the same result.
 */
import { CsvError, parse as parseSync, type Options } from 'csv-parse/sync';
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

/** csv-parse's reason for skipping a record; the line numbers it names count from the slice's first line. */
const skipMessage = (error: CsvError, offset: number) =>
  `the CSV could not be read here: ${error.message.replace(/\bline (\d+)/g, (_, line: string) => `line ${Number(line) + offset}`)}`;

/** Text is parsed in slices of about this many characters, cut at line ends, so records die young. */
const SLICE_CHARS = 1 << 16;

interface Slice {
  start: number;
  end: number;
  firstLine: number;
  /** Source lines of the records in this slice, when every record is one line. */
  recordLines: number[];
}

/**
 * Normalised text, whole or in pieces, read line by line: its `#` lines go to the collector as they
 * are met, its record lines are counted (and their quotes checked), and it is cut into slices at line
 * ends. Line numbers come from the text's own lines when every record is one line (every line's
 * quotes balance and the record count agrees); otherwise csv-parse is asked for them, which costs it
 * about twice the time. A quoted line break may cross a slice boundary: once a line's quotes do not
 * balance, the rest is read in one piece.
 *
 * `eager` parses each slice as soon as the next one begins, so a stream holds about one slice of
 * text; otherwise nothing is parsed before the end, when every `#` line and the row count are known.
 */
class SliceReader {
  private text = '';
  /** Where the first line not yet read starts in `text`. */
  private next = 0;
  private line = 0;
  private records = 0;
  private checkQuotes = false;
  private quotesBalance = true;
  /** Slices not yet parsed; the last one is still growing. */
  private readonly slices: Slice[] = [{ start: 0, end: 0, firstLine: 1, recordLines: [] }];

  constructor(
    private readonly collector: ReadingCollector,
    private readonly maxRows: number,
    private readonly eager: boolean,
  ) {}

  push(piece: string): void {
    this.text += piece;
    this.checkQuotes ||= piece.includes('"');
    this.readLines(false);
    if (this.eager) this.parseFinishedSlices();
  }

  end(): void {
    this.readLines(true);
    this.slices[this.slices.length - 1].end = this.text.length;
    if (this.tooManyRows()) return;
    // The header is one of the records.
    const [first] = this.slices;
    const pieces = this.quotesBalance ? this.slices : [{ start: first.start, end: this.text.length, firstLine: first.firstLine, recordLines: [] }];
    for (const slice of pieces) {
      if (this.collector.failed) return;
      collectSlice(this.text.slice(slice.start, slice.end), slice, this.collector, this.quotesBalance);
    }
  }

  /** Reads the whole lines that have come (at the end, the last one too). */
  private readLines(final: boolean): void {
    const { text, collector, checkQuotes } = this;
    let current = this.slices[this.slices.length - 1];
    let start = this.next;
    let line = this.line;
    let records = this.records;
    let quotesBalance = this.quotesBalance;
    for (;;) {
      if (start - current.start >= SLICE_CHARS && start < text.length) {
        current.end = start;
        current = { start, end: text.length, firstLine: line + 1, recordLines: [] };
        this.slices.push(current);
      }
      if (start >= text.length) break;
      let end = text.indexOf('\n', start);
      if (end === -1) {
        if (!final) break;
        end = text.length;
      }
      line++;
      if (text.charCodeAt(start) === 35 /* # */) {
        collector.comment(line, text.slice(start, end));
      } else if (end > start) {
        current.recordLines.push(line);
        records++;
        if (checkQuotes && quotesBalance) quotesBalance = text.slice(start, end).split('"').length % 2 === 1;
      }
      start = end + 1;
    }
    this.next = start;
    this.line = line;
    this.records = records;
    this.quotesBalance = quotesBalance;
  }

  private tooManyRows(): boolean {
    if (this.records - 1 <= this.maxRows) return false;
    this.collector.fail(`the file has more than ${this.maxRows} data rows; split it into smaller files`);
    return true;
  }

  /** Parses every slice but the growing one, then lets go of their text. */
  private parseFinishedSlices(): void {
    if (!this.quotesBalance || this.slices.length < 2 || this.tooManyRows()) return;
    while (this.slices.length > 1 && !this.collector.failed) {
      const slice = this.slices.shift()!;
      collectSlice(this.text.slice(slice.start, slice.end), slice, this.collector, true);
    }
    const done = this.slices[0].start;
    this.text = this.text.slice(done);
    this.next -= done;
    for (const slice of this.slices) {
      slice.start -= done;
      slice.end -= done;
    }
  }
}

/** Reads a whole normalised text (normalizeText): its `#` lines first, then its records slice by slice. */
export function collectText(text: string, collector: ReadingCollector, maxRows: number): void {
  const reader = new SliceReader(collector, maxRows, false);
  reader.push(text);
  reader.end();
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
  for (const error of skipped) collector.recordError((Number(error.lines) || 1) + offset, skipMessage(error, offset));
  for (const { record, info } of located) {
    if (collector.failed) break;
    collector.record(record, info.lines + offset);
  }
}

/**
 * Reads chunks as they come (any async iterable: a Node stream, a web ReadableStream, a generator);
 * stops at maxBytes. Each chunk is decoded and normalised, then read as the text is.
 */
export async function collectStream(source: AsyncIterable<Uint8Array | string>, collector: ReadingCollector, maxBytes: number, maxRows: number): Promise<void> {
  const reader = new SliceReader(collector, maxRows, true);
  const decoder = new TextDecoder('utf-8', { fatal: true });
  const encoder = new TextEncoder();
  const normalize = lineEndNormalizer();
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
      reader.push(normalize(decoder.decode(buffer, { stream: true }), false));
      if (collector.failed) break;
    }
    if (!collector.failed) reader.push(normalize(decoder.decode(), true));
  } catch (error) {
    collector.fail(error instanceof TypeError ? 'the file is not UTF-8 text' : `the file could not be read: ${String(error)}`);
  }
  if (!collector.failed) reader.end();
}
