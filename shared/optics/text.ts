/**
 * The text of a bench file as every reader of it sees it: UTF-8 without its byte-order mark, lines
 * ended by LF whatever the exporting program used (CRLF, or a bare CR), so the `#` lines, the rows and
 * their line numbers are the same for every variant.
 */

/** Drops a leading byte-order mark and turns CRLF and CR line ends into LF. */
export function normalizeText(text: string): string {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  return body.includes('\r') ? body.replace(/\r\n?/g, '\n') : body;
}

/** Whether a text takes more than `limit` bytes in UTF-8, counted without encoding it and only as far as needed. */
export function utf8Exceeds(text: string, limit: number): boolean {
  const units = text.length;
  // A UTF-16 unit takes one to three bytes in UTF-8 (a surrogate pair, two units, takes four).
  if (units > limit) return true;
  if (units * 3 <= limit) return false;
  let bytes = 0;
  for (let i = 0; i < units; i++) {
    const unit = text.charCodeAt(i);
    if (unit < 0x80) bytes += 1;
    else if (unit < 0x800) bytes += 2;
    else if ((unit & 0xfc00) === 0xd800 && (text.charCodeAt(i + 1) & 0xfc00) === 0xdc00) {
      bytes += 4;
      i++;
    } else bytes += 3; // a lone surrogate is encoded as U+FFFD
    if (bytes > limit) return true;
  }
  return false;
}

/** The normalised text of a file's bytes, or why they are not the text of a bench file. */
export function decodeBenchFile(bytes: Uint8Array, maxBytes: number): { text: string } | { fatal: string } {
  if (bytes.byteLength > maxBytes) return { fatal: `the file is larger than ${maxBytes} bytes` };
  if (bytes.includes(0)) return { fatal: 'the file is not text (it contains NUL bytes): expected a CSV file' };
  try {
    return { text: normalizeText(new TextDecoder('utf-8', { fatal: true }).decode(bytes)) };
  } catch {
    return { fatal: 'the file is not UTF-8 text' };
  }
}

/**
 * Normalises text that arrives in pieces: a CR at the end of one piece may be the first half of a
 * CRLF, so it waits for the next piece. (TextDecoder already drops the byte-order mark.)
 */
export function lineEndNormalizer(): (piece: string, final: boolean) => string {
  let heldCr = false;
  return (piece, final) => {
    let text = heldCr ? `\r${piece}` : piece;
    heldCr = !final && text.endsWith('\r');
    if (heldCr) text = text.slice(0, -1);
    return text.includes('\r') ? text.replace(/\r\n?/g, '\n') : text;
  };
}
