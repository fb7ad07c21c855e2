/**
 * npm run -s plan -- --lot-size 400 --level II --aql 0.65 --severity tightened
 * npm run -s plan -- --batch < queries.jsonl
 * Prints the single sampling plan as one line of JSON: {codeLetter, planLetter, sampleSize, accept,
 * reject, severity, hundredPercent}. With --batch, reads one JSON query per line of standard input
 * ({"lotSize":400,"level":"II","aql":0.65,"severity":"tightened"}) and prints one line per query, in
 * order; a bad line prints {"error": "line N: ..."} in its place and the rest go on. Bad arguments:
 * exit status 2, with the reason on standard error.
 */
import { createInterface } from 'node:readline';
import { parseArgs } from 'node:util';
import { lookUpPlan, samplingInputSchema } from '../shared/sampling/index.js';
import { planQuerySchema } from '../shared/schemas/sampling.js';

const USAGE = [
  'usage: npm run -s plan -- --lot-size N --level S-1|S-2|S-3|S-4|I|II|III --aql AQL --severity normal|tightened|reduced',
  '       npm run -s plan -- --batch   (one JSON query per line on standard input)',
].join('\n');

function stop(message: string): never {
  process.stderr.write(`plan: ${message}\n`);
  process.exit(2);
}

type Issue = { code: string; message: string; keys?: string[] };
const issues = (error: { issues: Issue[] }) =>
  error.issues
    .map((issue) =>
      issue.code === 'unrecognized_keys'
        ? `unknown field ${issue.keys!.map((key) => `"${key}"`).join(', ')} (a query has lotSize, level, aql and severity)`
        : issue.message,
    )
    .join('; ');

// A batch query is JSON, so its numbers must be JSON numbers and no other field is taken.
const batchQuerySchema = samplingInputSchema.strict();

function answerLine(text: string, lineNumber: number): string {
  let query: unknown;
  try {
    query = JSON.parse(text);
  } catch (error) {
    return JSON.stringify({ error: `line ${lineNumber}: not JSON: ${(error as Error).message}` });
  }
  if (query === null || typeof query !== 'object' || Array.isArray(query)) {
    return JSON.stringify({ error: `line ${lineNumber}: a query is a JSON object {"lotSize", "level", "aql", "severity"}` });
  }
  const parsed = batchQuerySchema.safeParse(query);
  if (!parsed.success) return JSON.stringify({ error: `line ${lineNumber}: ${issues(parsed.error)}` });
  return JSON.stringify(lookUpPlan(parsed.data));
}

async function batch() {
  let lineNumber = 0;
  for await (const line of createInterface({ input: process.stdin, crlfDelay: Infinity })) {
    lineNumber += 1;
    process.stdout.write(`${answerLine(line, lineNumber)}\n`);
  }
}

function main() {
  let parsed;
  try {
    parsed = parseArgs({
      options: { 'lot-size': { type: 'string' }, level: { type: 'string' }, aql: { type: 'string' }, severity: { type: 'string' }, batch: { type: 'boolean' } },
    });
  } catch (error) {
    stop(`${(error as Error).message}\n${USAGE}`);
  }
  const { batch: isBatch, ...options } = parsed.values;
  if (isBatch) {
    if (Object.keys(options).length > 0) stop(`--batch reads every query from standard input; leave out the other options\n${USAGE}`);
    return batch();
  }
  const missing = (['lot-size', 'level', 'aql', 'severity'] as const).filter((name) => options[name] === undefined);
  if (missing.length > 0) stop(`missing ${missing.map((name) => `--${name}`).join(', ')}\n${USAGE}`);
  const query = planQuerySchema.safeParse({ lotSize: options['lot-size'], level: options.level, aql: options.aql, severity: options.severity });
  if (!query.success) stop(issues(query.error));
  process.stdout.write(`${JSON.stringify(lookUpPlan(query.data))}\n`);
}

await main();
