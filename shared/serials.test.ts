import { describe, expect, it } from 'vitest';
import { parseSerialCells, parseSerialText } from './serials';

describe('serial numbers as the clerk gives them', () => {
  it('expands a range keeping the width of its first serial', () => {
    const { serials, errors } = parseSerialText('QW-0001..QW-0050');
    expect(errors).toEqual([]);
    expect(serials).toHaveLength(50);
    expect(serials[0]).toBe('QW-0001');
    expect(serials[49]).toBe('QW-0050');
  });

  it('reads serials one per line, or separated by commas, semicolons and spaces, with ranges among them', () => {
    const { serials, lines } = parseSerialText('HW-7\nHW-8, HW-9;HW-10\n\n  HW-20..HW-22  HW-30');
    expect(serials).toEqual(['HW-7', 'HW-8', 'HW-9', 'HW-10', 'HW-20', 'HW-21', 'HW-22', 'HW-30']);
    expect(lines).toEqual([1, 2, 2, 2, 4, 4, 4, 4]);
  });

  it('names every line with a problem', () => {
    const { errors } = parseSerialText(['QW-1', 'QW-9..QW-3', 'AB-1..CD-4', 'QW 1?', 'QW-1', 'X..Y'].join('\n'));
    expect(errors).toEqual([
      { line: 2, message: 'the range QW-9..QW-3 runs backwards' },
      { line: 3, message: 'the range AB-1..CD-4 changes its prefix (AB- to CD-)' },
      { line: 4, message: '"1?" is not a serial number (letters, digits and . _ / -, at most 80 characters)' },
      { line: 5, message: 'QW-1 is given twice (lines 1, 5)' },
      { line: 6, message: 'the range X..Y must end in a number on both sides' },
    ]);
  });

  it('finds a serial given twice through overlapping ranges', () => {
    const { errors } = parseSerialText('QW-0001..QW-0010\nQW-0010..QW-0012');
    expect(errors).toEqual([{ line: 2, message: 'QW-0010 is given twice (lines 1, 2)' }]);
  });

  it('refuses ranges too large to be a shipment', () => {
    expect(parseSerialText('P-1..P-20000').errors[0].message).toMatch(/holds 20000 serials; at most 10000/);
  });

  it('keeps the line numbers of file cells', () => {
    const { serials, errors } = parseSerialCells([
      { value: 'QW-0100', line: 2 },
      { value: ' ', line: 3 },
      { value: 'QW-0100', line: 7 },
    ]);
    expect(serials).toEqual(['QW-0100', 'QW-0100']);
    expect(errors).toEqual([{ line: 7, message: 'QW-0100 is given twice (lines 2, 7)' }]);
  });
});
