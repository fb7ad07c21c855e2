/** The analysis of one measurement file: text, bytes or stream in, AnalysisResult out. */
import { collectStream, collectText } from './csv.js';
import { evaluate } from './evaluate.js';
import { ReadingCollector } from './readings.js';
import { decodeBenchFile, normalizeText, utf8Exceeds } from './text.js';
import { parsePieceSpec, type PieceSpec, type PieceSpecInput } from './spec.js';
import { DEFAULT_MAX_BYTES, DEFAULT_MAX_ROWS, type AnalysisResult, type AnalyzeOptions } from './types.js';

function fatalResult(fatal: string): AnalysisResult {
  return { method: null, metadata: {}, columns: [], rows: [], pieces: [], serials: [], warnings: [], errors: [], fatal };
}

function start(specInput: PieceSpecInput, options: AnalyzeOptions): { spec: PieceSpec; collector: ReadingCollector } | string {
  const parsed = parsePieceSpec(specInput);
  if (!parsed.ok) return `invalid specification: ${parsed.message}`;
  const { spec } = parsed;
  return {
    spec,
    collector: new ReadingCollector({ s3Sign: spec.s3Sign, angleSign: spec.angleSign }, options.maxRows ?? DEFAULT_MAX_ROWS, options),
  };
}

function finish(collector: ReadingCollector, spec: PieceSpec): AnalysisResult {
  const collected = collector.result();
  const { method, metadata, columns, rows, warnings, errors, fatal } = collected;
  if (fatal !== undefined || method === null) {
    return { method, metadata, columns, rows: [], pieces: [], serials: [], warnings, errors, fatal: fatal ?? 'no recognisable header' };
  }
  const { pieces, serials } = evaluate(method, collected.groups, collected.groupsBySerial, spec, errors);
  return { method, metadata, columns, rows, pieces, serials, warnings, errors };
}

export function analyzeText(csvText: string, spec: PieceSpecInput, options: AnalyzeOptions = {}): AnalysisResult {
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES;
  if (utf8Exceeds(csvText, maxBytes)) {
    return fatalResult(`the file is larger than ${maxBytes} bytes`);
  }
  if (csvText.includes('\0')) return fatalResult('the file is not text (it contains NUL bytes): expected a CSV file');
  return analyzeNormalized(normalizeText(csvText), spec, options);
}

export function analyzeBuffer(buffer: Uint8Array, spec: PieceSpecInput, options: AnalyzeOptions = {}): AnalysisResult {
  const decoded = decodeBenchFile(buffer, options.maxBytes ?? DEFAULT_MAX_BYTES);
  return 'fatal' in decoded ? fatalResult(decoded.fatal) : analyzeNormalized(decoded.text, spec, options);
}

/** Text already through normalizeText (or decodeBenchFile): LF line ends, no byte-order mark. */
function analyzeNormalized(text: string, spec: PieceSpecInput, options: AnalyzeOptions): AnalysisResult {
  const begun = start(spec, options);
  if (typeof begun === 'string') return fatalResult(begun);
  collectText(text, begun.collector, options.maxRows ?? DEFAULT_MAX_ROWS);
  return finish(begun.collector, begun.spec);
}

export async function analyzeStream(source: AsyncIterable<Uint8Array | string>, spec: PieceSpecInput, options: AnalyzeOptions = {}): Promise<AnalysisResult> {
  const begun = start(spec, options);
  if (typeof begun === 'string') return fatalResult(begun);
  await collectStream(source, begun.collector, options.maxBytes ?? DEFAULT_MAX_BYTES, options.maxRows ?? DEFAULT_MAX_ROWS);
  return finish(begun.collector, begun.spec);
}
