import { Attachment } from '../../db/models';
import { notFound } from '../http/errors';

/** A document attached at receipt (packing slip, supplier's certificate), for its stored file. */
export async function findAttachment(id: number) {
  const attachment = await Attachment.findByPk(id);
  if (!attachment) throw notFound('Attachment');
  return attachment;
}
