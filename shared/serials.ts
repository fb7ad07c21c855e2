// Serial numbers as a clerk gives them: typed or pasted one per line or separated by commas, spaces
// or semicolons, and ranges such as QW-0001..QW-0050. Every problem names the line it is on.

export const SERIAL_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._/-]{0,79}$/;
export const MAX_RANGE = 10_000;

export type LineMessage = { line: number; message: string };
export type SerialList = { serials: string[]; lines: number[]; errors: LineMessage[] };

const RANGE = /^(.+?)\.\.(.+)$/;
const TRAILING_NUMBER = /^(.*?)(\d+)$/;

function expandRange(start: string, end: string): string[] | string {
  const a = TRAILING_NUMBER.exec(start);
  const b = TRAILING_NUMBER.exec(end);
  if (!a || !b) return `the range ${start}..${end} must end in a number on both sides`;
  if (a[1] !== b[1]) return `the range ${start}..${end} changes its prefix (${a[1] || 'none'} to ${b[1] || 'none'})`;
  const from = Number(a[2]);
  const to = Number(b[2]);
  if (to < from) return `the range ${start}..${end} runs backwards`;
  if (to - from + 1 > MAX_RANGE) return `the range ${start}..${end} holds ${to - from + 1} serials; at most ${MAX_RANGE} at once`;
  // Leading zeros of the first serial set the width: QW-0001..QW-0120 gives QW-0001 … QW-0120.
  const width = a[2].startsWith('0') ? a[2].length : 0;
  const serials: string[] = [];
  for (let n = from; n <= to; n++) serials.push(`${a[1]}${String(n).padStart(width, '0')}`);
  return serials;
}

/** Parses one token (a serial or a range) found on `line` into `into`. */
function addToken(token: string, line: number, into: SerialList) {
  const range = RANGE.exec(token);
  const expanded = range ? expandRange(range[1], range[2]) : [token];
  if (typeof expanded === 'string') {
    into.errors.push({ line, message: expanded });
    return;
  }
  for (const serial of expanded) {
    if (!SERIAL_PATTERN.test(serial)) {
      into.errors.push({ line, message: `"${serial}" is not a serial number (letters, digits and . _ / -, at most 80 characters)` });
      return;
    }
    into.serials.push(serial);
    into.lines.push(line);
  }
}

/** Every serial given twice, with the lines where it stands. */
function reportRepeats(list: SerialList) {
  const seen = new Map<string, number[]>();
  list.serials.forEach((serial, i) => seen.set(serial, [...(seen.get(serial) ?? []), list.lines[i]]));
  for (const [serial, lines] of seen) {
    if (lines.length > 1) list.errors.push({ line: lines[1], message: `${serial} is given twice (lines ${[...new Set(lines)].join(', ')})` });
  }
}

/** Parses already split cells (a CSV column), each with the line it came from. */
export function parseSerialCells(cells: { value: string; line: number }[]): SerialList {
  const list: SerialList = { serials: [], lines: [], errors: [] };
  for (const { value, line } of cells) {
    const token = value.trim();
    if (token) addToken(token, line, list);
  }
  reportRepeats(list);
  list.errors.sort((a, b) => a.line - b.line);
  return list;
}

/** Parses pasted or typed text; lines are counted from 1. */
export function parseSerialText(text: string): SerialList {
  const cells = text.split(/\r\n|\r|\n/).flatMap((content, index) => content.split(/[\s,;]+/).map((value) => ({ value, line: index + 1 })));
  return parseSerialCells(cells);
}
