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
