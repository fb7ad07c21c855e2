import { describe, expect, it } from 'vitest';
import stokesErrors from '../../tests/fixtures/readings/stokes-errors.csv?raw';
import { analyzeBuffer, analyzeText } from './analyze.js';
import { plainDecimal, readMetadata } from './readings.js';
import { DIRECT_HEADER, SCAN_HEADER, STOKES_HEADER, stokesRows } from './synthetic.js';
import type { PieceSpecInput } from './spec.js';
import { bytesOf, seededUniform } from './testing.js';

const QWP: PieceSpecInput = { nominalWaves: 0.25, designWavelengthNm: 632.8, retardanceTolWaves: 0.003, axisTolDeg: 0.5 };
const good = (serial = 'QW-0001', wavelengthNm = 632.8) => stokesRows({ serial, wavelengthNm, retardanceWaves: 0.2497, fastAxisDeg: 0.1 });
const lines = (...parts: (string | string[])[]) => parts.flat().join('\n');

describe('bad files: every problem with its line number', () => {
  it('refuses a file whose header names no method, saying which columns are missing', () => {
    const result = analyzeText(lines('# instrument: BENCH-2', 'serial,wavelength_nm,input,s0,s1,s2', 'QW-0001,632.8,H,1,1,0'), QWP);
    expect(result.fatal).toBe('line 2: no recognisable header: for the stokes method the column s3 is missing');
    expect(result.pieces).toEqual([]);
    expect(analyzeText('just some text\nand more', QWP).fatal).toMatch(
      /^line 1: no recognisable header: expected the columns of the stokes method \(serial, wavelength_nm, input, s0, s1, s2, s3\), or the scan method/,
    );
  });

  it('reports text in a number', () => {
    const rows = good();
    rows[2] = rows[2].replace(/,[^,]+,([^,]+),0$/, ',abc,$1,0');
    const result = analyzeText(lines(STOKES_HEADER, rows), QWP);
    expect(result.errors).toEqual([{ line: 4, message: 's2 is not a number: "abc"' }]);
    expect(result.pieces[0]).toMatchObject({ verdict: 'incomplete', reasons: ['readings with errors on line 4'], lines: [2, 3, 4, 5, 6, 7] });
  });

  it('reports an unknown input code', () => {
    const rows = good();
    rows[5] = rows[5].replace(',L,', ',Q,');
    const result = analyzeText(lines(STOKES_HEADER, rows), QWP);
    expect(result.errors).toEqual([{ line: 7, message: 'unknown input state "Q": expected H, V, D, A, R, L or an angle in degrees' }]);
  });

  it('reports a degree of polarisation above 1 and a non-positive s0', () => {
    const result = analyzeText(lines(STOKES_HEADER, good().slice(0, 4), 'QW-0001,632.8,R,1,0.9,0.5,0,0', 'QW-0001,632.8,L,0,0,0,0,0'), QWP);
    expect(result.errors).toEqual([
      { line: 6, message: 'degree of polarisation 1.030 is above 1 (more than the 0.02 noise allowance)' },
      { line: 7, message: 's0 must be positive, got 0' },
    ]);
  });

  it('marks a piece without a reading at the design wavelength incomplete, and a missing wavelength cell as an error', () => {
    const result = analyzeText(lines(STOKES_HEADER, good('QW-0002', 633.4), 'QW-0003,,H,1,1,0,0,0'), QWP);
    expect(result.pieces[0]).toMatchObject({
      serial: 'QW-0002',
      verdict: 'incomplete',
      reasons: ['no reading at the design wavelength 632.8 nm (±0.5 nm): this one is at 633.4 nm'],
      lines: [2, 3, 4, 5, 6, 7],
    });
    expect(result.serials[0]).toMatchObject({ verdict: 'incomplete', reasons: ['no reading at the design wavelength 632.8 nm (±0.5 nm)'] });
    expect(result.errors).toEqual([{ line: 8, message: 'wavelength_nm is missing' }]);
  });

  it('marks a piece with too few or degenerate inputs incomplete', () => {
    const three = analyzeText(lines(STOKES_HEADER, good().slice(0, 3)), QWP);
    expect(three.pieces[0]).toMatchObject({
      verdict: 'incomplete',
      reasons: ['too few inputs: 3 input states, at least 4 that span the Stokes space are needed'],
      lines: [2, 3, 4],
    });
    const linear = analyzeText(lines(STOKES_HEADER, good().slice(0, 4)), QWP);
    expect(linear.pieces[0].reasons).toEqual(['the input states do not span the Stokes space (add a circular or a diagonal state)']);
  });

  it('reports a Mueller matrix that is non-physical beyond noise as an error of the piece', () => {
    const rows = ['H,1,1,0,0', 'V,1,-1,0,0', 'D,1,0,1,0', 'A,1,0,1,0', 'R,1,0,0,1', 'L,1,0,0,-1'].map((r) => `QW-0004,632.8,${r},0`);
    const result = analyzeText(lines(STOKES_HEADER, rows), QWP);
    expect(result.errors).toEqual([
      {
        line: 2,
        message: expect.stringMatching(
          /^QW-0004 at 632.8 nm: the Mueller matrix from lines 2-7 is not physical \(coherency eigenvalue -0\.\d{3} m00, limit -0.02\)$/,
        ),
      },
    ]);
    expect(result.pieces[0].verdict).toBe('incomplete');
  });

  it('reports missing serials, unknown analyzers, unknown units and a mount that changes within a piece', () => {
    expect(analyzeText(lines(STOKES_HEADER, ',632.8,H,1,1,0,0,0'), QWP).errors).toEqual([{ line: 2, message: 'serial is missing' }]);
    expect(analyzeText(lines(SCAN_HEADER, 'QW-0001,632.8,sideways,10,0.4'), QWP).errors).toEqual([
      { line: 2, message: 'unknown analyzer "sideways": expected crossed, parallel or open' },
    ]);
    expect(analyzeText(lines(DIRECT_HEADER, 'QW-0001,632.8,0.25,furlongs,0,0'), QWP).errors).toEqual([
      { line: 2, message: 'unknown unit "furlongs": expected nm, waves, deg or rad' },
    ]);
    const rows = good();
    rows[3] = rows[3].replace(/,0$/, ',5');
    expect(analyzeText(lines(STOKES_HEADER, rows), QWP).errors).toEqual([{ line: 5, message: 'mount_deg 5 differs from 0 on line 2 for the same piece' }]);
  });

  it('reports a broken quote with its line and reads the rest', () => {
    const result = analyzeText(lines(DIRECT_HEADER, 'QW-0001,632.8,0.25,waves,0,0', '"QW-0002,632.8,0.25,waves,0,0'), QWP);
    expect(result.errors).toEqual([{ line: 3, message: expect.stringContaining('the CSV could not be read here: Quote Not Closed') }]);
    expect(result.pieces.map((p) => p.serial)).toEqual(['QW-0001']);
  });

  it('refuses binary content, other encodings, oversized files and too many rows', () => {
    expect(analyzeBuffer(Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]), QWP).fatal).toBe(
      'the file is not text (it contains NUL bytes): expected a CSV file',
    );
    expect(analyzeBuffer(Uint8Array.from([0x73, 0x65, 0x72, 0xe9, 0x0a]), QWP).fatal).toBe('the file is not UTF-8 text');
    const text = lines(STOKES_HEADER, good(), good('QW-0002'));
    expect(analyzeText(text, QWP, { maxBytes: 100 }).fatal).toBe('the file is larger than 100 bytes');
    expect(analyzeText(text, QWP, { maxRows: 10 }).fatal).toBe('the file has more than 10 data rows; split it into smaller files');
    expect(analyzeText(text, QWP, { maxRows: 12 }).fatal).toBeUndefined();
    expect(analyzeText('', QWP).fatal).toBe('no recognisable header: the file has no rows');
  });

  it('refuses an invalid specification', () => {
    expect(analyzeText(lines(STOKES_HEADER, good()), { ...QWP, axisTolDeg: -1 }).fatal).toBe(
      'invalid specification: axisTolDeg: Too small: expected number to be >=0',
    );
  });
});

describe('what the file may contain', () => {
  it('keeps the # metadata, skips comments and blank lines, and counts lines as they are in the file', () => {
    const text = lines('# instrument: BENCH-2', '# operator: QC-07', '# method: stokes', '# a plain remark', '', STOKES_HEADER, '', good());
    const result = analyzeText(text, QWP);
    expect(result.metadata).toEqual({ instrument: 'BENCH-2', operator: 'QC-07', method: 'stokes' });
    expect(result.pieces[0].lines).toEqual([8, 9, 10, 11, 12, 13]);
    expect(result.pieces[0].verdict).toBe('pass');
  });

  it('reads headers in any case with spaces, quoted fields, CRLF line ends and a byte-order mark', () => {
    const header = ' Serial , WAVELENGTH_NM,Input,S0,s1,s2,s3 ,"mount_deg"';
    const rows = good().map((r) => r.replace(/^QW-0001/, '"QW-0001"'));
    const result = analyzeText(`\uFEFF${[header, ...rows].join('\r\n')}\r\n`, QWP);
    expect(result.errors).toEqual([]);
    expect(result.pieces[0]).toMatchObject({ serial: 'QW-0001', verdict: 'pass', lines: [2, 3, 4, 5, 6, 7] });
  });

  it('keeps line numbers right when a quoted field spans lines', () => {
    const result = analyzeText(lines(DIRECT_HEADER + ',note', 'QW-0001,632.8,0.25,waves,0,0,"two', 'lines"', 'QW-0002,632.8,0.25,waves,x,0,'), QWP);
    expect(result.errors).toEqual([{ line: 4, message: 'fast_axis_deg is not a number: "x"' }]);
    expect(result.warnings).toEqual([{ line: 1, message: 'unknown column "note" ignored' }]);
  });

  it('warns about unknown columns and fields beyond the header', () => {
    const rows = good().map((r, i) => (i === 0 ? `${r},extra` : r));
    const result = analyzeText(lines(`${STOKES_HEADER},temperature_c`, rows), QWP);
    expect(result.warnings).toEqual([{ line: 1, message: 'unknown column "temperature_c" ignored' }]);
    const wide = analyzeText(lines(STOKES_HEADER, rows), QWP);
    expect(wide.warnings).toEqual([{ line: 2, message: '1 field beyond the header ignored' }]);
  });

  it('lets # method force a method, refuses an unknown one and ignores one after the header', () => {
    const forced = analyzeText(lines('# method: scan', STOKES_HEADER, good()), QWP);
    expect(forced.fatal).toBe('line 2: no recognisable header: for the scan method the columns analyzer, angle_deg, intensity are missing');
    expect(analyzeText(lines('# method: ellipsometry', STOKES_HEADER, good()), QWP).fatal).toBe(
      'line 1: unknown method "ellipsometry": expected stokes, scan or direct',
    );
    const late = analyzeText(lines(STOKES_HEADER, '# method: scan', good()), QWP);
    expect(late.method).toBe('stokes');
    expect(late.warnings).toEqual([{ line: 2, message: 'a method line after the header is ignored' }]);
  });

  it('reads the error fixture with every problem on its line', () => {
    const result = analyzeBuffer(bytesOf(stokesErrors), QWP);
    expect(result.errors).toEqual([
      { line: 7, message: 's3 is not a number: "abc"' },
      { line: 11, message: 'unknown input state "X": expected H, V, D, A, R, L or an angle in degrees' },
      { line: 13, message: 'degree of polarisation 1.150 is above 1 (more than the 0.02 noise allowance)' },
      { line: 17, message: 'wavelength_nm is missing' },
    ]);
    expect(result.warnings).toEqual([{ line: 4, message: 'unknown column "temperature_c" ignored' }]);
    expect(result.pieces.map((p) => [p.serial, p.verdict])).toEqual([
      ['QW-0301', 'incomplete'],
      ['QW-0302', 'incomplete'],
      ['QW-0303', 'incomplete'],
      ['QW-0305', 'incomplete'],
      ['QW-0306', 'incomplete'],
    ]);
  });
});

describe('one reading of the text, whatever its line ends', () => {
  const lf = lines('# instrument: BENCH-2', '# date: 2026-11-30', STOKES_HEADER, good('QW-0001'), good('QW-0002'), '');
  // Line ends and the byte-order mark are the usual variants of exported CSV (RFC 4180 uses CRLF;
  // older spreadsheet exports use a bare CR): common practice.
  const variants = {
    'a byte-order mark': `\uFEFF${lf}`,
    'CRLF line ends': lf.replaceAll('\n', '\r\n'),
    'CR-only line ends': lf.replaceAll('\n', '\r'),
    'a byte-order mark and CR-only line ends': `\uFEFF${lf.replaceAll('\n', '\r')}`,
  };

  it('gives the same metadata, rows and results as LF', () => {
    const reference = analyzeText(lf, QWP, { keepRows: true });
    expect(reference.metadata).toEqual({ instrument: 'BENCH-2', date: '2026-11-30' });
    expect(reference.rows.map((r) => r.line)).toEqual(Array.from({ length: 12 }, (_, i) => i + 4));
    for (const [name, text] of Object.entries(variants)) {
      expect(analyzeText(text, QWP, { keepRows: true }), name).toEqual(reference);
      expect(analyzeBuffer(bytesOf(text), QWP, { keepRows: true }), name).toEqual(reference);
    }
  });

  it('reads the instrument line the same way before the analysis', () => {
    for (const text of Object.values(variants)) {
      expect(readMetadata(text)).toEqual({ metadata: { instrument: 'BENCH-2', date: '2026-11-30' }, lines: { instrument: 1, date: 2 } });
    }
  });

  it('returns the rows it read, with their lines, serials, wavelengths and cells', () => {
    const result = analyzeText(
      lines(
        '# instrument: BENCH-2',
        `${STOKES_HEADER},temperature_c`,
        '',
        good().map((r) => `${r},21.5`),
      ),
      QWP,
      { keepRows: true },
    );
    expect(analyzeText(lines(STOKES_HEADER, good()), QWP).rows).toEqual([]);
    expect(result.columns).toEqual([...STOKES_HEADER.split(','), 'temperature_c']);
    expect(result.rows).toHaveLength(6);
    expect(result.rows[0]).toEqual({ line: 4, serial: 'QW-0001', wavelengthNm: 632.8, cells: `${good()[0]},21.5`.split(',') });
    expect(result.rows.map((r) => r.line)).toEqual(result.pieces[0].lines);
  });

  it('hands each row to onRow as it is read: the rows keepRows returns, in the same order, with the header', () => {
    const text = lines(`${STOKES_HEADER},temperature_c`, good('QW-0001'), 'QW-0002,632.8,H,abc,1,0,0,0', good('QW-0002'));
    const handed: { line: number; columns: readonly string[] }[] = [];
    const seen = analyzeText(text, QWP, { onRow: (row, columns) => handed.push({ line: row.line, columns }) });
    const kept = analyzeText(text, QWP, { keepRows: true });
    expect(seen.rows).toEqual([]);
    expect(handed.map((h) => h.line)).toEqual(kept.rows.map((r) => r.line));
    // The row with an error (line 8) became no reading, so it is not handed.
    expect(handed.map((h) => h.line)).not.toContain(8);
    expect(handed[0].columns).toEqual(kept.columns);
  });
});

describe('files that must be refused whole', () => {
  it('refuses a file with a header and no data rows', () => {
    for (const text of [lines('# instrument: BENCH-2', STOKES_HEADER), lines(STOKES_HEADER, '', ''), `${STOKES_HEADER}\r\n\r\n`]) {
      const result = analyzeText(text, QWP, { keepRows: true });
      expect(result.fatal).toMatch(/^line [12]: the header is not followed by any data rows$/);
      expect(result.rows).toEqual([]);
    }
  });

  it('refuses a file whose instrument or date lines contradict each other, naming both lines', () => {
    expect(analyzeText(lines('# instrument: BENCH-0', STOKES_HEADER, good(), '# instrument: BENCH-2'), QWP).fatal).toBe(
      'line 9: "# instrument: BENCH-2" contradicts "# instrument: BENCH-0" on line 1',
    );
    expect(analyzeText(lines('# date: 2026-11-30', '# date: 2026-12-01', STOKES_HEADER, good()), QWP).fatal).toBe(
      'line 2: "# date: 2026-12-01" contradicts "# date: 2026-11-30" on line 1',
    );
    // Saying the same thing twice is harmless.
    expect(analyzeText(lines('# instrument: BENCH-2', '# instrument: BENCH-2', STOKES_HEADER, good()), QWP).fatal).toBeUndefined();
  });
});

describe('repeated rows', () => {
  it('reports every repeated row of a Stokes file with both line numbers', () => {
    const rows = good();
    const result = analyzeText(
      lines(
        STOKES_HEADER,
        rows.flatMap((r) => [r, r]),
      ),
      QWP,
    );
    expect(result.errors).toEqual(
      ['H', 'V', 'D', 'A', 'R', 'L'].map((input, i) => ({
        line: 3 + 2 * i,
        message: `repeats line ${2 + 2 * i}: QW-0001 at 632.8 nm with input ${input} is already measured there`,
      })),
    );
    expect(result.pieces[0].verdict).toBe('incomplete');
  });

  it('knows an input state by its polarisation, not by how the cell spells it', () => {
    // Linear light at 0° is H and at 180° is the same state (Stokes parameters of linear light: Hecht ch. 8).
    const rows = [...good(), 'QW-0001,632.8,0,1,1,0,0,0', 'QW-0001,632.8,180,1,1,0,0,0', 'QW-0001,632.8,h,1,1,0,0,0'];
    expect(analyzeText(lines(STOKES_HEADER, rows), QWP).errors).toEqual([
      { line: 8, message: 'repeats line 2: QW-0001 at 632.8 nm with input 0 is already measured there' },
      { line: 9, message: 'repeats line 2: QW-0001 at 632.8 nm with input 180 is already measured there' },
      { line: 10, message: 'repeats line 2: QW-0001 at 632.8 nm with input h is already measured there' },
    ]);
    // The same input at another wavelength or on another piece is a new measurement.
    expect(analyzeText(lines(STOKES_HEADER, good('QW-0001', 632.8), good('QW-0001', 1064), good('QW-0002')), QWP).errors).toEqual([]);
  });

  it('reports a scan row at an angle already read with the same analyzer, and a second open row', () => {
    const rows = ['HW-1,532,open,0,1000', 'HW-1,532,crossed,10,120', 'HW-1,532,parallel,10,880', 'HW-1,532,crossed,10,121', 'HW-1,532,open,0,999'];
    expect(analyzeText(lines(SCAN_HEADER, rows), QWP).errors).toEqual([
      { line: 5, message: 'repeats line 3: HW-1 at 532 nm with analyzer crossed at 10° is already measured there' },
      { line: 6, message: 'repeats line 2: HW-1 at 532 nm with analyzer open is already measured there' },
    ]);
  });

  it('averages repeated direct readings but refuses a copied one', () => {
    const rows = ['QW-0010,632.8,0.2497,waves,0.2,0', 'QW-0010,632.8,0.2503,waves,0.4,0', 'QW-0010,632.8,0.2497,waves,0.2,0'];
    expect(analyzeText(lines(DIRECT_HEADER, rows), QWP).errors).toEqual([
      { line: 4, message: 'repeats line 2: QW-0010 at 632.8 nm with the same reading is already measured there' },
    ]);
  });
});

describe('plain decimal cells', () => {
  it('reads them exactly as Number() does, and leaves every other cell to Number()', () => {
    const random = seededUniform(5, 1e14, 1e15);
    const cells = ['0', '-0', '7', '632.8', '-0.707107', '0.000001', '.5', '-.5', '5.', '00012.50', '123456789012345', '0.12345678901234'];
    for (let i = 0; i < 20_000; i++) {
      const digits = String(Math.floor(random())).slice(0, 1 + (i % 15));
      const point = i % (digits.length + 1);
      cells.push(`${i % 2 ? '-' : ''}${digits.slice(0, point)}.${digits.slice(point)}`);
    }
    for (const cell of cells) expect(Object.is(plainDecimal(cell), Number(cell)), cell).toBe(true);
    for (const cell of ['', ' 1', '1 ', '+1', '1e3', '0x10', '-', '.', '1.2.3', 'Infinity', '1234567890123456', '1,5']) {
      expect(plainDecimal(cell), cell).toBeNaN();
    }
  });
});
