import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));
const fixtures = join(root, 'tests/fixtures/readings');

function analyze(...args: string[]) {
  const run = spawnSync(join(root, 'node_modules/.bin/tsx'), ['scripts/analyze.ts', ...args], { cwd: root, encoding: 'utf8' });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

describe('npm run -s analyze -- --spec SPEC.json FILE.csv', () => {
  it('prints the JSON of readings.md and exits 0', () => {
    const run = analyze('--spec', join(fixtures, 'qwp-632.spec.json'), join(fixtures, 'stokes-qwp.csv'));
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const output = JSON.parse(run.stdout);
    expect(output.method).toBe('stokes');
    expect(output.metadata).toMatchObject({ instrument: 'BENCH-2', operator: 'QC-07' });
    expect(output.warnings).toEqual([]);
    expect(output.errors).toEqual([]);
    expect(output.pieces.map((p: { serial: string; verdict: string }) => [p.serial, p.verdict])).toEqual([
      ['QW-0001', 'pass'],
      ['QW-0002', 'pass'],
      ['QW-0003', 'fail'],
      ['QW-0004', 'fail'],
    ]);
    const fields = ['serial', 'wavelengthNm', 'retardanceWaves', 'retardanceNm', 'retardanceErrorWaves', 'fastAxisDeg', 'axisErrorDeg', 'verdict', 'reasons'];
    for (const piece of output.pieces) expect(Object.keys(piece)).toEqual(expect.arrayContaining(fields));
    expect(output.pieces[2].reasons).toEqual(['fast-axis mark on the slow axis']);
    // Printed to six decimals: the product agrees to a thousandth of a nm.
    expect(output.pieces[0].retardanceNm).toBeCloseTo(output.pieces[0].retardanceWaves * 632.8, 3);
  });

  it('exits 0 for a file with row errors, listing them', () => {
    const run = analyze('--spec', join(fixtures, 'qwp-632.spec.json'), join(fixtures, 'stokes-errors.csv'));
    expect(run.status).toBe(0);
    expect(JSON.parse(run.stdout).errors[0]).toEqual({ line: 7, message: 's3 is not a number: "abc"' });
  });

  it('runs on the scan, direct and multi-wavelength fixtures', () => {
    const scan = analyze('--spec', join(fixtures, 'hwp-532.spec.json'), join(fixtures, 'scan-hwp.csv'));
    expect(JSON.parse(scan.stdout).pieces.map((p: { verdict: string }) => p.verdict)).toEqual(['pass', 'pass', 'fail']);
    const direct = analyze('--spec', join(fixtures, 'qwp-632.spec.json'), join(fixtures, 'direct-qwp.csv'));
    expect(JSON.parse(direct.stdout).method).toBe('direct');
    const quartz = analyze('--spec', join(fixtures, 'qwp-quartz-zero-order.spec.json'), join(fixtures, 'quartz-multiwavelength.csv'));
    expect(JSON.parse(quartz.stdout).serials.map((s: { verdict: string }) => s.verdict)).toEqual(['pass', 'fail']);
  });

  it('exits 2 with the reason on standard error for a missing file, a non-CSV file or a bad spec', () => {
    const spec = join(fixtures, 'qwp-632.spec.json');
    const missing = analyze('--spec', spec, join(fixtures, 'no-such-file.csv'));
    expect(missing.status).toBe(2);
    expect(missing.stdout).toBe('');
    expect(missing.stderr).toMatch(/no-such-file\.csv: no such file/);

    const dir = mkdtempSync(join(tmpdir(), 'phaselot-analyze-'));
    const binary = join(dir, 'image.csv');
    writeFileSync(binary, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48]));
    const notCsv = analyze('--spec', spec, binary);
    expect(notCsv.status).toBe(2);
    expect(notCsv.stderr).toMatch(/not text/);

    const prose = join(dir, 'letter.csv');
    writeFileSync(prose, 'Dear supplier,\nplease find the plates enclosed.\n');
    const noHeader = analyze('--spec', spec, prose);
    expect(noHeader.status).toBe(2);
    expect(noHeader.stderr).toMatch(/no recognisable header/);

    const badSpec = join(dir, 'spec.json');
    writeFileSync(badSpec, JSON.stringify({ nominalWaves: 0.25, retardanceTolWaves: 0.003, axisTolDeg: 0.5 }));
    const invalid = analyze('--spec', badSpec, join(fixtures, 'stokes-qwp.csv'));
    expect(invalid.status).toBe(2);
    expect(invalid.stderr).toMatch(/designWavelengthNm/);

    expect(analyze(join(fixtures, 'stokes-qwp.csv')).status).toBe(2);
  });
});
