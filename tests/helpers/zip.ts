// Reading ZIP downloads back in tests: supertest collects the binary body, yauzl lists the entries.
import type { Response } from 'superagent';
import yauzl from 'yauzl';

/** A supertest parser that keeps a binary response body as one Buffer. */
export function binaryParser(res: Response, done: (error: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = [];
  res.on('data', (chunk: Buffer) => chunks.push(chunk));
  res.on('end', () => done(null, Buffer.concat(chunks)));
}

/** Every entry of a ZIP, by path, with its uncompressed bytes. */
export function readZip(zip: Buffer): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(zip, { lazyEntries: true }, (openError, archive) => {
      if (openError) return reject(openError);
      const entries = new Map<string, Buffer>();
      archive.on('error', reject);
      archive.on('end', () => resolve(entries));
      archive.on('entry', (entry: yauzl.Entry) => {
        archive.openReadStream(entry, (readError, stream) => {
          if (readError) return reject(readError);
          const chunks: Buffer[] = [];
          stream.on('data', (chunk: Buffer) => chunks.push(chunk));
          stream.on('error', reject);
          stream.on('end', () => {
            entries.set(entry.fileName, Buffer.concat(chunks));
            archive.readEntry();
          });
        });
      });
      archive.readEntry();
    });
  });
}
