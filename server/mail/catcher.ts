// The local mail catcher: an SMTP server on 127.0.0.1 that accepts every message and keeps it as an
// .eml file, so that development and tests see exactly what a real relay would have delivered.
import { SMTPServer } from 'smtp-server';
import { mkdirSync, writeFileSync, renameSync } from 'node:fs';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';

export interface MailCatcher {
  port: number;
  dir: string;
  close(): Promise<void>;
}

export function startMailCatcher(options: { port: number; dir: string; host?: string }): Promise<MailCatcher> {
  mkdirSync(options.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    banner: 'Phaselot mail catcher',
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => {
        const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomUUID().slice(0, 8)}.eml`;
        // Written under a temporary name first so a reader never sees half a message.
        const partial = join(options.dir, `.${name}.part`);
        writeFileSync(partial, Buffer.concat(chunks));
        renameSync(partial, join(options.dir, name));
        callback();
      });
    },
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, options.host ?? '127.0.0.1', () => {
      const address = server.server.address();
      resolve({
        // Port 0 asks the system for a free one; this is the one it gave.
        port: typeof address === 'object' && address ? address.port : options.port,
        dir: options.dir,
        close: () => new Promise<void>((done) => server.close(() => done())),
      });
    });
  });
}
