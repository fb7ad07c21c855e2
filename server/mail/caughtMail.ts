// Reads the messages the local catcher kept, newest first.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import type { CaughtMessage } from '../../shared/schemas/mail';

const addressText = (a: AddressObject | AddressObject[] | undefined) => (Array.isArray(a) ? a : a ? [a] : []).map((x) => x.text).join(', ');

// A caught file never changes once it has its name (the catcher renames it into place), so each is
// parsed once: a folder of hundreds of messages with PDFs is read again every time someone looks.
const parsedFiles = new Map<string, Promise<CaughtMessage>>();

async function parseCaught(path: string, name: string): Promise<CaughtMessage> {
  const parsed = await simpleParser(await readFile(path));
  return {
    id: name.replace(/\.eml$/, ''),
    receivedAt: (parsed.date ?? new Date()).toISOString(),
    from: addressText(parsed.from),
    to: addressText(parsed.to),
    subject: parsed.subject ?? '',
    text: parsed.text ?? '',
    attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.size })),
  };
}

export async function readCaughtMail(dir: string): Promise<CaughtMessage[]> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith('.eml'));
  } catch {
    return [];
  }
  names.sort().reverse();
  return Promise.all(
    names.map((name) => {
      const path = join(dir, name);
      let message = parsedFiles.get(path);
      if (!message) {
        message = parseCaught(path, name);
        parsedFiles.set(path, message);
        // A file that could not be read is tried again next time.
        message.catch(() => parsedFiles.delete(path));
      }
      return message;
    }),
  );
}
