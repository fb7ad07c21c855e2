// The plan look-up on the command line (scripts/plan.ts). Expected plans are those of the single
// sampling tables as encoded in the AQLSchemes R package (R/AAZ14Single.R), which tables.test.ts
// copies whole; the cells used here are quoted beside each check.
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { lookUpPlan } from '../../shared/sampling/plan';
import { AQL_VALUES, INSPECTION_LEVELS, SEVERITIES } from '../../shared/sampling/tables';

const root = fileURLToPath(new URL('../..', import.meta.url));

function plan(args: string[], input?: string) {
  const run = spawnSync(join(root, 'node_modules/.bin/tsx'), ['scripts/plan.ts', ...args], { cwd: root, encoding: 'utf8', input });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

describe('npm run -s plan -- --lot-size N --level L --aql A --severity S', () => {
  it('prints one JSON object: both letters, the table n, Ac, Re, the severity and whether every piece is inspected', () => {
    // 400 pieces at level II: code letter H (Table 1, row 281-500). Tightened at AQL 0.65: H, J ↓ to
    // K, n = 125, Ac 1 / Re 2 (tightened: ss row H col 0.65 = 125, c10 = 1, re c10 = 2).
    const run = plan(['--lot-size', '400', '--level', 'II', '--aql', '0.65', '--severity', 'tightened']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('{"codeLetter":"H","planLetter":"K","sampleSize":125,"accept":1,"reject":2,"severity":"tightened","hundredPercent":false}\n');
  });

  it('reports 100 % inspection with the table n when n reaches the lot size', () => {
    // 10 pieces at level II: code letter B; reduced at AQL 10: C's 0/2 plan, n = 2 (reduced c16 row B:
    // Ac 0, Re 2; ss 2). Normal at AQL 1.0: E, n = 13 ≥ 10 (normal ss row B col 1.0 = 13).
    expect(JSON.parse(plan(['--lot-size', '10', '--level', 'II', '--aql', '10', '--severity', 'reduced']).stdout)).toEqual({
      codeLetter: 'B',
      planLetter: 'C',
      sampleSize: 2,
      accept: 0,
      reject: 2,
      severity: 'reduced',
      hundredPercent: false,
    });
    expect(JSON.parse(plan(['--lot-size', '10', '--level', 'II', '--aql', '1', '--severity', 'normal']).stdout)).toMatchObject({
      planLetter: 'E',
      sampleSize: 13,
      hundredPercent: true,
    });
  });

  it('exits 2 with the reason on standard error for missing, unknown or invalid arguments', () => {
    const missing = plan(['--lot-size', '400', '--level', 'II']);
    expect(missing).toMatchObject({ status: 2, stdout: '' });
    expect(missing.stderr).toMatch(/^plan: missing --aql, --severity\nusage: /);
    const unknown = plan(['--lot-size', '400', '--lvl', 'II']);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toMatch(/Unknown option '--lvl'/);
    const invalid = plan(['--lot-size', '12.5', '--level', 'IV', '--aql', '0.3', '--severity', 'normal']);
    expect(invalid.status).toBe(2);
    expect(invalid.stderr).toBe(
      'plan: lot size must be a whole number of pieces; inspection level must be one of S-1, S-2, S-3, S-4, I, II, III; AQL must be one of 0.065, 0.1, 0.15, 0.25, 0.4, 0.65, 1, 1.5, 2.5, 4, 6.5, 10 (percent nonconforming)\n',
    );
    expect(plan(['--batch', '--aql', '1']).status).toBe(2);
  });
});

describe('npm run -s plan -- --batch', () => {
  it('answers every level, AQL and severity, one line per query in the order given', () => {
    const queries = INSPECTION_LEVELS.flatMap((level) => AQL_VALUES.flatMap((aql) => SEVERITIES.map((severity) => ({ lotSize: 1500, level, aql, severity }))));
    const run = plan(['--batch'], queries.map((query) => JSON.stringify(query)).join('\n') + '\n');
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const lines = run.stdout.trimEnd().split('\n');
    expect(lines).toHaveLength(queries.length);
    // The command answers what the checked tables give, query by query.
    lines.forEach((line, index) => expect(JSON.parse(line), JSON.stringify(queries[index])).toEqual(lookUpPlan(queries[index])));
    // 1500 pieces at level III: code letter L (Table 1, row 1201-3200); reduced at AQL 2.5: L, n = 80,
    // Ac 5 / Re 8 (reduced ss row L col 2.5 = 80, c13 = 5, re c13 = 8).
    const index = queries.findIndex((q) => q.level === 'III' && q.aql === 2.5 && q.severity === 'reduced');
    expect(JSON.parse(lines[index])).toEqual({
      codeLetter: 'L',
      planLetter: 'L',
      sampleSize: 80,
      accept: 5,
      reject: 8,
      severity: 'reduced',
      hundredPercent: false,
    });
  });

  it('answers a bad line with an error on that line and goes on', () => {
    const input = [
      '{"lotSize":400,"level":"II","aql":1,"severity":"normal"}',
      'not json',
      '{"lotSize":400,"level":"II","aql":0.3,"severity":"normal"}',
      '{"lot_size":400,"level":"II","aql":1,"severity":"normal"}',
      '',
      '[400]',
      '{"lotSize":20,"level":"II","aql":1,"severity":"normal"}',
    ].join('\r\n');
    const run = plan(['--batch'], input);
    expect(run.status).toBe(0);
    const lines = run.stdout
      .trimEnd()
      .split('\n')
      .map((line) => JSON.parse(line));
    expect(lines).toHaveLength(7);
    // 400 at II: H, n = 50, Ac 1 / Re 2 (normal ss row H col 1.0 = 50, c11 = 1).
    expect(lines[0]).toMatchObject({ codeLetter: 'H', planLetter: 'H', sampleSize: 50, accept: 1, reject: 2 });
    expect(lines[1].error).toMatch(/^line 2: not JSON: /);
    expect(lines[2]).toEqual({ error: 'line 3: AQL must be one of 0.065, 0.1, 0.15, 0.25, 0.4, 0.65, 1, 1.5, 2.5, 4, 6.5, 10 (percent nonconforming)' });
    expect(lines[3].error).toMatch(/^line 4: .*unknown field "lot_size"/);
    expect(lines[4].error).toMatch(/^line 5: not JSON/);
    expect(lines[5]).toEqual({ error: 'line 6: a query is a JSON object {"lotSize", "level", "aql", "severity"}' });
    // 20 at II: code letter C, whose arrow at AQL 1.0 leads to E, n = 13 (normal ss row C col 1.0 = 13).
    expect(lines[6]).toMatchObject({ codeLetter: 'C', planLetter: 'E', sampleSize: 13, accept: 0, reject: 1, hundredPercent: false });
  });
});
