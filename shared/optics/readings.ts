/**
 * Rows of a measurement file to readings grouped by serial and wavelength (readings.md, "The file").
 * Fed record by record (from csv.ts), so it works the same on a whole text and on a stream;
 * a bad row becomes an error with its line number, never an exception.
 */
import { ANALYZERS, type Analyzer, type ScanReading } from './scan.js';
import { degreeOfPolarization, inputStateReader, type InstrumentProfile, type Stokes } from './stokes.js';
import { normalizeText } from './text.js';
import { METHODS, type AnalyzeOptions, type FileMetadata, type LineMessage, type Method, type ParsedRow } from './types.js';
import { DEG, parseRetardanceUnit, toWaves } from './units.js';
import { plural } from '../format.js';

export interface DirectReading {
  /** Total retardance as reported, in waves (any sign, any order). */
  waves: number;
  fastAxisDeg: number;
  line: number;
}

export interface ReadingsByMethod {
  /** The input state (one array per distinct cell, shared); the output is in Group.outputs. */
  stokes: Stokes;
  scan: ScanReading;
  direct: DirectReading;
}

export interface Group<M extends Method = Method> {
  serial: string;
  /** Where the group is in the file's order (Collected.groups). */
  order: number;
  wavelengthNm: number;
  /** Angle of the fast-axis mark in the lab frame, degrees (our frame). */
  mountDeg: number;
  lines: number[];
  /** Lines of this piece's rows that had errors (those rows are not in `readings`). */
  errorLines: number[];
  readings: ReadingsByMethod[M][];
  /**
   * Stokes method: the output of each reading, four numbers each, in the order of `readings`: flat,
   * so that a row leaves no array of its own behind.
   */
  outputs: number[];
  /** What each reading measured (its repeat key), in the order of `readings` and `lines`, to catch a row read twice. */
  measured: string[];
}

export interface Collected {
  method: Method | null;
  metadata: FileMetadata;
  columns: string[];
  rows: ParsedRow[];
  /** In the file's order: by their first rows. */
  groups: Group[];
  /** The same groups by serial, each serial's in the file's order; serials by their first rows. */
  groupsBySerial: Group[][];
  warnings: LineMessage[];
  errors: LineMessage[];
  fatal?: string;
}

/** Degree of polarisation above 1 by more than this is an error of the reading, not noise. */
export const MAX_DOP_EXCESS = 0.02;

type Columns = Record<string, number>;

interface MethodColumns {
  required: readonly string[];
  optional: readonly string[];
}

export const METHOD_COLUMNS: Record<Method, MethodColumns> = {
  stokes: { required: ['serial', 'wavelength_nm', 'input', 's0', 's1', 's2', 's3'], optional: ['mount_deg'] },
  scan: { required: ['serial', 'wavelength_nm', 'analyzer', 'angle_deg', 'intensity'], optional: [] },
  direct: { required: ['serial', 'wavelength_nm', 'retardance', 'unit', 'fast_axis_deg'], optional: ['mount_deg'] },
};

/** 10^0 to 10^15, each an exact double. */
const POWERS_OF_TEN = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/**
 * A plain decimal cell (an optional minus, at most 15 digits, at most one point) read without
 * Number(), which costs several times more and is called six times a row; NaN for any other cell,
 * left to Number(). Exact: an integer below 2^53 divided by an exact power of ten is rounded once,
 * to the nearest double, as Number() rounds the decimal itself.
 */
export function plainDecimal(cell: string): number {
  const negative = cell.charCodeAt(0) === 45; // a minus sign
  let mantissa = 0;
  let digits = 0;
  let point = -1;
  for (let i = negative ? 1 : 0; i < cell.length; i++) {
    const code = cell.charCodeAt(i);
    if (code >= 48 && code <= 57) {
      mantissa = mantissa * 10 + (code - 48);
      digits++;
    } else if (code === 46 /* . */ && point === -1) {
      point = i;
    } else {
      return NaN;
    }
  }
  if (digits === 0 || digits > 15) return NaN;
  const value = point === -1 ? mantissa : mantissa / POWERS_OF_TEN[cell.length - 1 - point];
  return negative ? -value : value;
}

/** Reads the numeric cell `name` (at index `column`); NaN, with the problem noted, when it is missing or not a number. */
function numberCell(fields: readonly string[], column: number, name: string, problems: string[]): number {
  const cell = fields[column];
  const plain = cell === undefined ? NaN : plainDecimal(cell);
  if (!Number.isNaN(plain)) return plain;
  // Number() reads a blank cell as 0, so only a 0 needs the blank check.
  const value = cell === undefined ? NaN : Number(cell);
  if (cell === undefined || (value === 0 && cell.trim() === '')) {
    problems.push(`${name} is missing`);
    return NaN;
  }
  if (!Number.isFinite(value)) {
    problems.push(`${name} is not a number: ${JSON.stringify(cell.trim())}`);
    return NaN;
  }
  return value;
}

function textCell(fields: readonly string[], column: number, name: string, problems: string[]): string {
  const cell = (fields[column] ?? '').trim();
  if (cell === '') problems.push(`${name} is missing`);
  return cell;
}

interface RowContext {
  profile: InstrumentProfile;
  readInput: (cell: string) => Stokes | null;
  line: number;
  wavelengthNm: number;
  /** Where the Stokes parser leaves the row's output (in our frame), until the collector copies it into its group. */
  output: [number, number, number, number];
}

/** The reading of one row; when the row noted problems it is discarded, placeholders and all. */
type RowParser<M extends Method> = (fields: readonly string[], columns: Columns, context: RowContext, problems: string[]) => ReadingsByMethod[M];

/** The placeholder input of a Stokes row whose input cell could not be read (the row is discarded). */
const UNPOLARIZED: Stokes = [1, 0, 0, 0];

const ROW_PARSERS: { [M in Method]: RowParser<M> } = {
  stokes(fields, columns, { profile, readInput, output }, problems) {
    const inputCell = textCell(fields, columns.input, 'input', problems);
    const input = inputCell === '' ? null : readInput(inputCell);
    if (inputCell !== '' && !input) {
      problems.push(`unknown input state ${JSON.stringify(inputCell)}: expected H, V, D, A, R, L or an angle in degrees`);
    }
    const raw = output;
    raw[0] = numberCell(fields, columns.s0, 's0', problems);
    raw[1] = numberCell(fields, columns.s1, 's1', problems);
    raw[2] = numberCell(fields, columns.s2, 's2', problems);
    raw[3] = numberCell(fields, columns.s3, 's3', problems);
    if (!Number.isNaN(raw[0]) && raw[0] <= 0) {
      problems.push(`s0 must be positive, got ${raw[0]}`);
    } else if (!(Number.isNaN(raw[0]) || Number.isNaN(raw[1]) || Number.isNaN(raw[2]) || Number.isNaN(raw[3]))) {
      const dop = degreeOfPolarization(raw);
      if (dop > 1 + MAX_DOP_EXCESS) {
        problems.push(`degree of polarisation ${dop.toFixed(3)} is above 1 (more than the ${MAX_DOP_EXCESS} noise allowance)`);
      }
    }
    // Into our frame in place, as toOurFrame does it.
    raw[2] *= profile.angleSign;
    raw[3] *= profile.s3Sign;
    return input ?? UNPOLARIZED;
  },
  scan(fields, columns, { profile }, problems) {
    const analyzerCell = textCell(fields, columns.analyzer, 'analyzer', problems).toLowerCase();
    if (analyzerCell !== '' && !(ANALYZERS as readonly string[]).includes(analyzerCell)) {
      problems.push(`unknown analyzer ${JSON.stringify(analyzerCell)}: expected crossed, parallel or open`);
    }
    const angle = analyzerCell === 'open' ? 0 : numberCell(fields, columns.angle_deg, 'angle_deg', problems);
    const intensity = numberCell(fields, columns.intensity, 'intensity', problems);
    return { analyzer: analyzerCell as Analyzer, angle: angle * profile.angleSign * DEG, intensity };
  },
  direct(fields, columns, { profile, line, wavelengthNm }, problems) {
    const retardance = numberCell(fields, columns.retardance, 'retardance', problems);
    const unitCell = textCell(fields, columns.unit, 'unit', problems);
    const unit = parseRetardanceUnit(unitCell);
    if (unitCell !== '' && !unit) problems.push(`unknown unit ${JSON.stringify(unitCell)}: expected nm, waves, deg or rad`);
    const axis = numberCell(fields, columns.fast_axis_deg, 'fast_axis_deg', problems);
    // The opposite S3 handedness turns a retarder's rotation around: it reads with its axes swapped.
    const fastAxisDeg = axis * profile.angleSign + (profile.s3Sign === -1 ? 90 : 0);
    return { waves: unit ? toWaves(retardance, unit, wavelengthNm) : NaN, fastAxisDeg, line };
  },
};

/**
 * What a reading measured, for telling a second reading of the same thing: the input state by its
 * polarisation (so H, h, 0 and 180 are one state), the analyzer and stage angle, and for direct
 * readings (whose repeats are averaged) the reading itself, so only a copied row counts.
 */
interface RepeatCheck<M extends Method> {
  key(reading: ReadingsByMethod[M]): string;
  /** What was measured twice, in the file's own words (only built for a repeat). */
  what(reading: ReadingsByMethod[M], fields: readonly string[], columns: Columns): string;
}

const inputKeys = new WeakMap<Stokes, string>();

const REPEATS: { [M in Method]: RepeatCheck<M> } = {
  stokes: {
    key: (input) => {
      // The reader hands out one array per distinct cell, so the key is built once per input state.
      let key = inputKeys.get(input);
      if (key === undefined) {
        key = `${Math.round(input[1] * 1e9)},${Math.round(input[2] * 1e9)},${Math.round(input[3] * 1e9)}`;
        inputKeys.set(input, key);
      }
      return key;
    },
    what: (_reading, fields, columns) => `input ${fields[columns.input].trim()}`,
  },
  scan: {
    key: ({ analyzer, angle }) => (analyzer === 'open' ? analyzer : `${analyzer}@${angle}`),
    what: ({ analyzer }, fields, columns) => (analyzer === 'open' ? 'analyzer open' : `analyzer ${analyzer} at ${fields[columns.angle_deg].trim()}°`),
  },
  direct: { key: ({ waves, fastAxisDeg }) => `${waves}@${fastAxisDeg}`, what: () => 'the same reading' },
};

/** Metadata that decides how a file is judged (on which instrument, on which day): stated once. */
const GOVERNING_KEYS = new Set(['instrument', 'date']);

/** `# key: value`, the key one word (instrument, operator, method, date...); other `#` lines are plain comments. */
const METADATA_LINE = /^#\s*([A-Za-z][\w-]*)\s*:\s*(.*?)\s*$/;

/** The key (lower-case) and value of a `# key: value` line, or null for any other line. */
export function metadataEntry(line: string): [key: string, value: string] | null {
  const match = METADATA_LINE.exec(line);
  return match ? [match[1].toLowerCase(), match[2]] : null;
}

/** Only the `# key: value` lines of a file, without reading its rows: enough to know which
 * instrument (and so which profile) the file has to be analysed with. Lines are counted as the
 * engine counts them, whatever the file's line ends; `lines` says where each key was (last) given. */
export function readMetadata(text: string): { metadata: FileMetadata; lines: Record<string, number> } {
  const metadata: FileMetadata = {};
  const lines: Record<string, number> = {};
  const normalized = normalizeText(text);
  // Line by line without cutting the text into lines: only `#` lines are read.
  for (let start = 0, line = 1; start <= normalized.length; line++) {
    const end = normalized.indexOf('\n', start);
    const stop = end === -1 ? normalized.length : end;
    const entry = normalized.charCodeAt(start) === 35 /* # */ ? metadataEntry(normalized.slice(start, stop)) : null;
    if (entry) {
      metadata[entry[0]] = entry[1];
      lines[entry[0]] = line;
    }
    if (end === -1) break;
    start = end + 1;
  }
  return { metadata, lines };
}

export class ReadingCollector {
  private method: Method | null = null;
  private methodLine: { line: number; method: Method } | null = null;
  private columns: Columns | null = null;
  private columnNames: string[] = [];
  private headerLine = 0;
  private headerWidth = 0;
  /** Reused for every row: the hot path of files with 100,000 rows. */
  private readonly context: RowContext;
  private rows = 0;
  private fatal: string | undefined;
  private readonly metadata: FileMetadata = {};
  private readonly metadataLines = new Map<string, number>();
  private readonly parsedRows: ParsedRow[] = [];
  /** Each serial's groups, one per wavelength; `ordered` keeps the file's order. */
  private readonly groups = new Map<string, Group[]>();
  /** The group of the row before: a piece's rows usually follow each other. */
  private lastGroup: Group | undefined;
  private readonly ordered: Group[] = [];
  private readonly warnings: LineMessage[] = [];
  private readonly errors: LineMessage[] = [];

  private readonly keepRows: boolean;
  private previousRowCells: string[] | undefined;
  private readonly onRow: AnalyzeOptions['onRow'];

  constructor(
    private readonly profile: InstrumentProfile,
    private readonly maxRows: number,
    rows: Pick<AnalyzeOptions, 'keepRows' | 'onRow'> = {},
  ) {
    this.keepRows = rows.keepRows ?? false;
    this.onRow = rows.onRow;
    this.context = { profile, readInput: inputStateReader(profile), line: 0, wavelengthNm: NaN, output: [NaN, NaN, NaN, NaN] };
  }

  get failed(): boolean {
    return this.fatal !== undefined;
  }

  fail(message: string): void {
    this.fatal ??= message;
  }

  /**
   * A whole `#` line of the file (with its '#'). Comments may arrive ahead of the records around
   * them (a stream is read ahead of its parser), so only their line numbers say what came first.
   */
  comment(line: number, text: string): void {
    const entry = metadataEntry(text);
    if (!entry) return;
    const [key, value] = entry;
    const earlier = this.metadataLines.get(key);
    if (GOVERNING_KEYS.has(key) && earlier !== undefined && this.metadata[key] !== value) {
      const [first, second] = earlier < line ? [earlier, line] : [line, earlier];
      const [firstValue, secondValue] = earlier < line ? [this.metadata[key], value] : [value, this.metadata[key]];
      this.fail(`line ${second}: "# ${key}: ${secondValue}" contradicts "# ${key}: ${firstValue}" on line ${first}`);
    }
    this.metadata[key] = value;
    this.metadataLines.set(key, line);
    if (key !== 'method') return;
    const method = value.toLowerCase() as Method;
    if (!METHODS.includes(method)) {
      this.fail(`line ${line}: unknown method ${JSON.stringify(value)}: expected stokes, scan or direct`);
    } else if (!this.methodLine || line < this.methodLine.line) {
      this.methodLine = { line, method };
    }
  }

  /** A CSV parse problem of one record (unbalanced quotes and the like). */
  recordError(line: number, message: string): void {
    this.errors.push({ line, message });
  }

  /** The record is the collector's from here on: a kept row holds it as its cells (and shares strings with the row before). */
  record(fields: string[], line: number): void {
    if (this.fatal) return;
    if (fields[0].trim() === '' && fields.every((f) => f.trim() === '')) return;
    if (!this.columns) {
      this.header(fields, line);
      return;
    }
    if (++this.rows > this.maxRows) {
      this.fail(`the file has more than ${this.maxRows} data rows; split it into smaller files`);
      return;
    }
    this.row(fields, line);
  }

  private header(fields: readonly string[], line: number): void {
    const names = fields.map((f) => f.trim().toLowerCase());
    const present = new Set(names);
    const missing = (m: Method) => METHOD_COLUMNS[m].required.filter((c) => !present.has(c));
    let forced: Method | null = null;
    if (this.methodLine && this.methodLine.line < line) forced = this.methodLine.method;
    else if (this.methodLine) this.warnings.push({ line: this.methodLine.line, message: 'a method line after the header is ignored' });
    const method = forced ?? METHODS.find((m) => missing(m).length === 0);
    if (!method || missing(method).length > 0) {
      const closest = method ?? [...METHODS].sort((a, b) => missing(a).length - missing(b).length)[0];
      const expected = METHOD_COLUMNS[closest].required;
      this.fail(
        missing(closest).length < expected.length
          ? `line ${line}: no recognisable header: for the ${closest} method ${missing(closest).length === 1 ? 'the column' : 'the columns'} ${missing(closest).join(', ')} ${missing(closest).length === 1 ? 'is' : 'are'} missing`
          : `line ${line}: no recognisable header: expected the columns of the ` +
              METHODS.map((m) => `${m} method (${METHOD_COLUMNS[m].required.join(', ')})`).join(', or the '),
      );
      return;
    }
    const known = new Set([...METHOD_COLUMNS[method].required, ...METHOD_COLUMNS[method].optional]);
    const columns: Columns = {};
    names.forEach((name, index) => {
      if (!known.has(name)) {
        this.warnings.push({ line, message: `unknown column ${JSON.stringify(name)} ignored` });
      } else if (name in columns) {
        this.warnings.push({ line, message: `column ${JSON.stringify(name)} appears twice; the first one is used` });
      } else {
        columns[name] = index;
      }
    });
    this.method = method;
    this.columns = columns;
    this.columnNames = names;
    this.headerLine = line;
    this.headerWidth = fields.length;
  }

  private row(fields: string[], line: number): void {
    // Before the cells are read, so that the serial taken from them is the shared string too.
    if (this.keepRows || this.onRow) this.shareCellsWithPreviousRow(fields);
    const columns = this.columns!;
    const method = this.method!;
    const problems: string[] = [];
    const serial = textCell(fields, columns.serial, 'serial', problems);
    const wavelengthNm = numberCell(fields, columns.wavelength_nm, 'wavelength_nm', problems);
    if (wavelengthNm <= 0) problems.push(`wavelength_nm must be positive, got ${wavelengthNm}`);
    const mountCell = columns.mount_deg === undefined ? undefined : fields[columns.mount_deg];
    const mountDeg =
      mountCell !== undefined && mountCell.trim() !== '' ? numberCell(fields, columns.mount_deg, 'mount_deg', problems) * this.profile.angleSign : 0;
    this.context.line = line;
    this.context.wavelengthNm = wavelengthNm;
    const reading = ROW_PARSERS[method](fields, columns, this.context, problems);
    if (fields.length > this.headerWidth && fields.slice(this.headerWidth).some((f) => f.trim() !== '')) {
      this.warnings.push({ line, message: `${plural(fields.length - this.headerWidth, 'field')} beyond the header ignored` });
    }

    const group = serial !== '' && wavelengthNm > 0 ? this.group(serial, wavelengthNm, mountDeg) : undefined;
    if (group && problems.length === 0 && group.readings.length > 0 && mountDeg !== group.mountDeg) {
      problems.push(`mount_deg ${mountDeg} differs from ${group.mountDeg} on line ${group.lines[0]} for the same piece`);
    }
    const repeats = REPEATS[method] as RepeatCheck<Method>;
    const key = group && problems.length === 0 ? repeats.key(reading) : '';
    const measuredOn = group && problems.length === 0 ? group.lines[group.measured.indexOf(key)] : undefined;
    if (measuredOn !== undefined) {
      problems.push(`repeats line ${measuredOn}: ${serial} at ${wavelengthNm} nm with ${repeats.what(reading, fields, columns)} is already measured there`);
    }
    if (problems.length > 0) {
      for (const message of problems) this.errors.push({ line, message });
      group?.errorLines.push(line);
      return;
    }
    if (group!.readings.length === 0) group!.mountDeg = mountDeg;
    group!.lines.push(line);
    group!.measured.push(key);
    (group!.readings as ReadingsByMethod[Method][]).push(reading);
    if (method === 'stokes') {
      const { output } = this.context;
      group!.outputs.push(output[0], output[1], output[2], output[3]);
    }
    if (this.keepRows || this.onRow) {
      const row = { line, serial, wavelengthNm, cells: fields };
      if (this.keepRows) this.parsedRows.push(row);
      this.onRow?.(row, this.columnNames);
    }
  }

  /**
   * A piece's rows repeat most of their cells (serial, wavelength, mount): when rows are handed
   * out, a cell equal to the one in the same column of the row before becomes that very string, so
   * rows held by the thousand hold each repeated text once, sparing the garbage collector half
   * their strings.
   */
  private shareCellsWithPreviousRow(fields: string[]): void {
    const previous = this.previousRowCells;
    if (previous) {
      const shared = Math.min(fields.length, previous.length);
      for (let i = 0; i < shared; i++) if (fields[i] === previous[i]) fields[i] = previous[i];
    }
    this.previousRowCells = fields;
  }

  private group(serial: string, wavelengthNm: number, mountDeg: number): Group {
    const last = this.lastGroup;
    if (last && last.wavelengthNm === wavelengthNm && last.serial === serial) return last;
    let bySerial = this.groups.get(serial);
    if (!bySerial) {
      bySerial = [];
      this.groups.set(serial, bySerial);
    }
    let group = bySerial.find((g) => g.wavelengthNm === wavelengthNm);
    if (!group) {
      group = { serial, order: this.ordered.length, wavelengthNm, mountDeg, lines: [], errorLines: [], readings: [], outputs: [], measured: [] };
      bySerial.push(group);
      this.ordered.push(group);
    }
    this.lastGroup = group;
    return group;
  }

  result(): Collected {
    if (!this.fatal && !this.columns) this.fail('no recognisable header: the file has no rows');
    if (!this.fatal && this.rows === 0) this.fail(`line ${this.headerLine}: the header is not followed by any data rows`);
    return {
      method: this.method,
      metadata: this.metadata,
      columns: this.columnNames,
      rows: this.parsedRows,
      groups: this.ordered,
      groupsBySerial: [...this.groups.values()],
      warnings: this.warnings,
      errors: this.errors,
      fatal: this.fatal,
    };
  }
}
