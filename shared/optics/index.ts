/**
 * Phaselot analysis engine: measurement files of wave plates to per-piece verdicts.
 * Pure TypeScript (no database, no HTTP, no file system, no Node built-ins); conventions and file formats are those
 * of shared/spec/readings.md.
 *
 * Stable API for the server:
 *
 *   analyzeText(csvText: string, spec: PieceSpecInput, options?: AnalyzeOptions): AnalysisResult
 *   analyzeBuffer(bytes: Uint8Array, spec: PieceSpecInput, options?: AnalyzeOptions): AnalysisResult   (any byte array)
 *   analyzeStream(source: AsyncIterable<Uint8Array | string>, spec: PieceSpecInput,
 *                 options?: AnalyzeOptions): Promise<AnalysisResult>     (e.g. a Node Readable)
 *     Every form parses in slices cut at line ends and takes line numbers from the text itself; the
 *     stream form parses each slice as the next one begins, so it holds about one slice of text.
 *     The results are the same.
 *
 *   AnalyzeOptions = { maxBytes?: number (default 32 MiB), maxRows?: number (default 200,000),
 *                      keepRows?: boolean (default false: rows stay empty),
 *                      onRow?: (row, columns) => void (each row that becomes a reading, as it is read) }
 *
 *     Every form reads the text as normalizeText leaves it: no byte-order mark, CRLF and CR line
 *     ends as LF, so line numbers and `#` lines are the same for all of them.
 *
 *   AnalysisResult = {
 *     method: 'stokes' | 'scan' | 'direct' | null,
 *     metadata: { instrument?, operator?, method?, ...every `# key: value` line },
 *     columns: string[],          the header's names, trimmed and lower-case
 *     rows: ParsedRow[],          with keepRows, every data row that became a reading: { line, serial,
 *                                 wavelengthNm, cells }, in file order (what onRow is handed one by one)
 *     pieces: PieceResult[],      one per serial and wavelength, in file order
 *     serials: SerialResult[],    one per serial: its verdict over all its wavelengths
 *     warnings: { line, message }[],
 *     errors: { line, message }[],   every bad row with its line (a repeated row names the line
 *                                 it repeats); never thrown
 *     fatal?: string,             the file could not be read at all (not text, not CSV, no header,
 *                                 no data rows, contradicting instrument or date lines, too large,
 *                                 too many rows, invalid spec); then pieces and rows are empty
 *   }
 *
 *   PieceResult: serial, wavelengthNm, retardanceWaves, retardanceNm, retardanceErrorWaves,
 *     fastAxisDeg, axisErrorDeg, verdict ('pass' | 'fail' | 'incomplete'), reasons (the fields
 *     of readings.md; null where not measurable), and method, retardanceErrorNm,
 *     retardanceErrorDeg, mountDeg, judged, axisAmbiguous, lines, notes; Stokes method:
 *     diattenuation, depolarization, depolarizationIndex, circularRetardanceDeg, mueller,
 *     fitResidual; several wavelengths of a quartz or MgF2 plate: estimatedOrder, thicknessMm,
 *     totalRetardanceWaves, orderAmbiguous. See types.ts.
 *
 *   readMetadata(text): the `# key: value` lines alone, with their line numbers, for choosing the
 *     instrument before the analysis; decodeBenchFile(bytes, maxBytes): bytes to normalised text.
 *
 *   pieceSpecSchema (zod) / parsePieceSpec(json) for SPEC.json; PieceSpec is the parsed form.
 *
 * The numeric layers below (Jones, Mueller, polar decomposition, scan fit, dispersion, units,
 * acceptance) are exported for the server's charts and for tests.
 */
export { analyzeBuffer, analyzeStream, analyzeText } from './analyze.js';
export { nominalFraction, parsePieceSpec, pieceSpecSchema, type PieceSpec, type PieceSpecInput } from './spec.js';
export * from './types.js';
export * from './jones.js';
export * from './mueller.js';
export * from './stokes.js';
export * from './units.js';
export { polarDecomposition, type PolarDecomposition, type PolarResult } from './polar.js';
export { fitScan, type ScanFit, type ScanReading, type ScanResult } from './scan.js';
export { MATERIALS, estimateOrder, type Material, type OrderEstimate } from './dispersion.js';
export { MARK_ON_SLOW_AXIS, accepts, describeAlongMark, judge, measuredFromAlongMark } from './judge.js';
export { DESIGN_WAVELENGTH_WINDOW_NM } from './evaluate.js';
export { readMetadata } from './readings.js';
export { decodeBenchFile, normalizeText } from './text.js';
