// Reads the messages the local catcher kept, newest first.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import type { CaughtMessage } from '../../shared/schemas/mail';

const addressText = (a: AddressObject | AddressObject[] | undefined) => (Array.isArray(a) ? a : a ? [a] : []).map((x) => x.text).join(', ');

export async function readCaughtMail(dir: string): Promise<CaughtMessage[]> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith('.eml'));
  } catch {
    return [];
  }
  names.sort().reverse();
  return Promise.all(
    names.map(async (name) => {
      const parsed = await simpleParser(await readFile(join(dir, name)));
      return {
        id: name.replace(/\.eml$/, ''),
        receivedAt: (parsed.date ?? new Date()).toISOString(),
        from: addressText(parsed.from),
        to: addressText(parsed.to),
        subject: parsed.subject ?? '',
        text: parsed.text ?? '',
        attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.size })),
      };
    }),
  );
}
