// The migration that moves mail attachments out of the outbox rows into the file store, and back.
import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import * as migration from '../../db/migrations/20261202-0802-mail-attachments-in-file-store';
import { readBlob, sha256 } from '../storage/blobs';

const context = { sequelize, queryInterface: sequelize.getQueryInterface() };
const attachmentsOf = async (id: number) =>
  (
    await sequelize.query<{ attachments: Record<string, string>[] }>('SELECT attachments FROM mail_outbox WHERE id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id },
    })
  )[0].attachments;

describe('mail attachments in the file store (migration 0802)', () => {
  it('moves inline attachments of queued and sent mail into the store, and back on the way down', async () => {
    const pdf = Buffer.from(`%PDF-1.4 report ${Math.random()}`);
    const note = Buffer.from('a note');
    const inline = [
      { filename: 'PLR-2026-00001.pdf', contentType: 'application/pdf', contentBase64: pdf.toString('base64') },
      { filename: 'note.txt', contentType: 'text/plain', contentBase64: note.toString('base64') },
    ];
    const [{ id }] = await sequelize.query<{ id: number }>(
      `INSERT INTO mail_outbox (recipients, subject, body_text, attachments, status) VALUES (ARRAY['buyer@phaselot.test'], 'Written before the file store', 'x', CAST(:attachments AS jsonb), 'sent') RETURNING id`,
      { type: QueryTypes.SELECT, replacements: { attachments: JSON.stringify(inline) } },
    );

    await migration.up(context);
    const stored = await attachmentsOf(id);
    expect(stored).toEqual([
      { filename: 'PLR-2026-00001.pdf', contentType: 'application/pdf', storageKey: sha256(pdf) },
      { filename: 'note.txt', contentType: 'text/plain', storageKey: sha256(note) },
    ]);
    expect((await readBlob(stored[0].storageKey)).equals(pdf)).toBe(true);
    expect((await readBlob(stored[1].storageKey)).equals(note)).toBe(true);

    await migration.down(context);
    expect(await attachmentsOf(id)).toEqual(inline);
    await migration.up(context);
    expect(await attachmentsOf(id)).toEqual(stored);
  });
});
