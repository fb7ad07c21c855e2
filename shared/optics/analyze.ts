/** The analysis of one measurement file: text, bytes or stream in, AnalysisResult out. */
import { collectStream, collectText } from './csv.js';
import { evaluate } from './evaluate.js';
import { ReadingCollector } from './readings.js';
import { parsePieceSpec, type PieceSpec, type PieceSpecInput } from './spec.js';
import { DEFAULT_MAX_BYTES, DEFAULT_MAX_ROWS, type AnalysisResult, type AnalyzeOptions } from './types.js';

function fatalResult(fatal: string): AnalysisResult {
  return { method: null, metadata: {}, pieces: [], serials: [], warnings: [], errors: [], fatal };
}

function start(specInput: PieceSpecInput, options: AnalyzeOptions): { spec: PieceSpec; collector: ReadingCollector } | string {
  const parsed = parsePieceSpec(specInput);
  if (!parsed.ok) return `invalid specification: ${parsed.message}`;
  const { spec } = parsed;
  return {
    spec,
    collector: new ReadingCollector({ s3Sign: spec.s3Sign, angleSign: spec.angleSign }, options.maxRows ?? DEFAULT_MAX_ROWS),
  };
}

function finish(collector: ReadingCollector, spec: PieceSpec): AnalysisResult {
  const collected = collector.result();
  const { method, metadata, warnings, errors, fatal } = collected;
  if (fatal !== undefined || method === null) {
    return { method, metadata, pieces: [], serials: [], warnings, errors, fatal: fatal ?? 'no recognisable header' };
  }
  const { pieces, serials } = evaluate(method, collected.groups, spec, errors);
  return { method, metadata, pieces, serials, warnings, errors };
}

export function analyzeText(csvText: string, spec: PieceSpecInput, options: AnalyzeOptions = {}): AnalysisResult {
  const begun = start(spec, options);
  if (typeof begun === 'string') return fatalResult(begun);
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES;
  if (csvText.length > maxBytes || Buffer.byteLength(csvText) > maxBytes) {
    return fatalResult(`the file is larger than ${maxBytes} bytes`);
  }
  if (csvText.includes('\0')) return fatalResult('the file is not text (it contains NUL bytes): expected a CSV file');
  const text = csvText.charCodeAt(0) === 0xfeff ? csvText.slice(1) : csvText;
  collectText(text, begun.collector, options.maxRows ?? DEFAULT_MAX_ROWS);
  return finish(begun.collector, begun.spec);
}

export function analyzeBuffer(buffer: Uint8Array, spec: PieceSpecInput, options: AnalyzeOptions = {}): AnalysisResult {
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES;
  if (buffer.byteLength > maxBytes) return fatalResult(`the file is larger than ${maxBytes} bytes`);
  if (buffer.includes(0)) return fatalResult('the file is not text (it contains NUL bytes): expected a CSV file');
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    return fatalResult('the file is not UTF-8 text');
  }
  return analyzeText(text, spec, options);
}

export async function analyzeStream(
  source: AsyncIterable<Uint8Array | string>,
  spec: PieceSpecInput,
  options: AnalyzeOptions = {},
): Promise<AnalysisResult> {
  const begun = start(spec, options);
  if (typeof begun === 'string') return fatalResult(begun);
  await collectStream(source, begun.collector, options.maxBytes ?? DEFAULT_MAX_BYTES);
  return finish(begun.collector, begun.spec);
}
