// Mail attachments move from base64 inside the outbox row into the file store: the row keeps the
// file's key, as every other record of a stored file does. Needs the file store's configuration
// (README), like the server.
import { QueryTypes, type Transaction } from 'sequelize';
import { readBlob, storeBlob } from '../../server/storage/blobs';
import type { Migration } from '../migrator';

type Inline = { filename: string; contentType: string; contentBase64: string };
type Stored = { filename: string; contentType: string; storageKey: string };

async function rewrite<From, To>(
  context: Parameters<Migration>[0],
  has: 'contentBase64' | 'storageKey',
  convert: (attachment: From, transaction: Transaction) => Promise<To>,
) {
  const { sequelize } = context;
  await sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<{ id: number; attachments: From[] }>(
      `SELECT id, attachments FROM mail_outbox WHERE EXISTS (SELECT 1 FROM jsonb_array_elements(attachments) a WHERE a->>'${has}' IS NOT NULL) ORDER BY id`,
      { type: QueryTypes.SELECT, transaction },
    );
    for (const row of rows) {
      const converted: To[] = [];
      for (const attachment of row.attachments) converted.push(await convert(attachment, transaction));
      await sequelize.query('UPDATE mail_outbox SET attachments = CAST(:attachments AS jsonb) WHERE id = :id', {
        replacements: { id: row.id, attachments: JSON.stringify(converted) },
        transaction,
      });
    }
  });
}

export const up: Migration = (context) =>
  rewrite<Inline, Stored>(context, 'contentBase64', async (a, transaction) => ({
    filename: a.filename,
    contentType: a.contentType,
    storageKey: await storeBlob(Buffer.from(a.contentBase64, 'base64'), transaction),
  }));

export const down: Migration = (context) =>
  rewrite<Stored, Inline>(context, 'storageKey', async (a) => ({
    filename: a.filename,
    contentType: a.contentType,
    contentBase64: (await readBlob(a.storageKey)).toString('base64'),
  }));
