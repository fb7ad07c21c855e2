/** Results of the analysis of one measurement file (the JSON of readings.md, plus extra fields). */

export type Method = 'stokes' | 'scan' | 'direct';
export const METHODS: readonly Method[] = ['stokes', 'scan', 'direct'];

export type Verdict = 'pass' | 'fail' | 'incomplete';

export interface LineMessage {
  line: number;
  message: string;
}

/** `# key: value` lines of the file; keys lower-case. */
export interface FileMetadata {
  instrument?: string;
  operator?: string;
  method?: string;
  [key: string]: string | undefined;
}

/** One serial at one wavelength. Values that could not be measured are null. */
export interface PieceResult {
  serial: string;
  wavelengthNm: number;
  /** Retardance along the mark (w_m), [0, 1) waves. */
  retardanceWaves: number | null;
  /** retardanceWaves at this wavelength, in nm. */
  retardanceNm: number | null;
  /** Measured - nominal (fractional parts), waves. */
  retardanceErrorWaves: number | null;
  /** Measured fast axis f in the lab frame, degrees in (-90, 90] (scan: the axis error modulo 90°). */
  fastAxisDeg: number | null;
  /** Axis error of the mark along the mark (e_m), degrees. */
  axisErrorDeg: number | null;
  verdict: Verdict;
  reasons: string[];

  method: Method;
  retardanceErrorNm: number | null;
  retardanceErrorDeg: number | null;
  mountDeg: number;
  /** Whether this wavelength is judged against the specification (design wavelength, or inside the band). */
  judged: boolean;
  /** The scan method: fast and slow axis not told apart. */
  axisAmbiguous: boolean;
  /** Stokes method: |D| of the polar decomposition. */
  diattenuation?: number;
  /** Stokes method: depolarisation power Δ of the polar decomposition (0 = none). */
  depolarization?: number;
  /** Stokes method: depolarisation index of Gil & Bernabeu (1 = none). */
  depolarizationIndex?: number;
  /** Stokes method: circular component of the retardance vector, degrees (Lu & Chipman). */
  circularRetardanceDeg?: number;
  /** Stokes method: the Mueller matrix normalised to m00 = 1, row-major. */
  mueller?: number[];
  /** Rms residual of the fit, relative to the intensity. */
  fitResidual?: number;
  /** Several wavelengths of one plate: whole waves at the design wavelength, from the birefringence dispersion. */
  estimatedOrder?: number;
  thicknessMm?: number;
  /** Total retardance at the design wavelength, waves. */
  totalRetardanceWaves?: number;
  orderAmbiguous?: boolean;
  /** Source lines of the readings. */
  lines: number[];
  /** Remarks that do not change the verdict. */
  notes: string[];
}

/** The piece (serial) over all its wavelengths. */
export interface SerialResult {
  serial: string;
  verdict: Verdict;
  reasons: string[];
  wavelengthsNm: number[];
  estimatedOrder?: number;
  thicknessMm?: number;
  orderAmbiguous?: boolean;
}

/** One data row of the file that became a reading: where it is, whose it is, and its cells as read. */
export interface ParsedRow {
  line: number;
  serial: string;
  wavelengthNm: number;
  /** The row's fields in header order, untrimmed (`columns` names them). */
  cells: readonly string[];
}

export interface AnalysisResult {
  method: Method | null;
  metadata: FileMetadata;
  /** The header's names, trimmed and lower-case, in file order (unknown ones too). */
  columns: string[];
  /** With `keepRows`: every data row that became a reading, in file order; empty when the file is refused whole. */
  rows: ParsedRow[];
  pieces: PieceResult[];
  serials: SerialResult[];
  warnings: LineMessage[];
  errors: LineMessage[];
  /** Set when the file could not be read at all; then nothing else is meaningful. */
  fatal?: string;
}

export interface AnalyzeOptions {
  /** Largest accepted file, bytes (default 32 MiB). */
  maxBytes?: number;
  /** Most data rows accepted (default 200,000). */
  maxRows?: number;
  /** Return the rows read (`rows`); holding them costs memory and time. */
  keepRows?: boolean;
  /**
   * Called with each row that becomes a reading as soon as it is read, in file order, with the
   * header's names: how the server stores the rows without holding them all. A file refused whole
   * may have handed some rows before it was refused.
   */
  onRow?: (row: ParsedRow, columns: readonly string[]) => void;
}

export const DEFAULT_MAX_BYTES = 32 * 1024 * 1024;
export const DEFAULT_MAX_ROWS = 200_000;
