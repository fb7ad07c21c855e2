/**
 * npm run -s analyze -- --spec SPEC.json FILE.csv
 * Prints the analysis of a measurement file as JSON (readings.md). Exit status 0 whenever the file
 * could be read, even with row errors; 2, with the reason on standard error, when it could not.
 */
import { createReadStream } from 'node:fs';
import { readFile, stat } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { analyzeStream, parsePieceSpec } from '../shared/optics/index.js';

const USAGE = 'usage: npm run -s analyze -- --spec SPEC.json FILE.csv';

function stop(message: string): never {
  process.stderr.write(`analyze: ${message}\n`);
  process.exit(2);
}

const reason = (error: unknown) =>
  (error as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : error instanceof Error ? error.message : String(error);

async function main(): Promise<void> {
  let parsed;
  try {
    parsed = parseArgs({ options: { spec: { type: 'string' } }, allowPositionals: true });
  } catch (error) {
    stop(`${reason(error)}\n${USAGE}`);
  }
  const { values, positionals } = parsed;
  if (!values.spec || positionals.length !== 1) stop(USAGE);
  const [file] = positionals;

  let specJson: unknown;
  try {
    specJson = JSON.parse(await readFile(values.spec, 'utf8'));
  } catch (error) {
    stop(`${values.spec}: ${error instanceof SyntaxError ? `not JSON: ${error.message}` : reason(error)}`);
  }
  const spec = parsePieceSpec(specJson);
  if (!spec.ok) stop(`${values.spec}: ${spec.message}`);

  try {
    if (!(await stat(file)).isFile()) stop(`${file}: not a file`);
  } catch (error) {
    stop(`${file}: ${reason(error)}`);
  }
  const result = await analyzeStream(createReadStream(file), spec.spec);
  if (result.fatal) stop(`${file}: ${result.fatal}`);

  const { method, metadata, pieces, serials, warnings, errors } = result;
  // Six decimals are far below any tolerance and keep the JSON readable.
  const rounded = (_key: string, value: unknown) => (typeof value === 'number' && !Number.isInteger(value) ? Number(value.toFixed(6)) : value);
  process.stdout.write(`${JSON.stringify({ method, metadata, pieces, serials, warnings, errors }, rounded, 2)}\n`);
}

await main();
