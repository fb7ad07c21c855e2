// The files of a receipt: documents (packing slip, supplier's certificate) whose type is read from
// their content, and an optional CSV of serial numbers read with its line numbers.
import { CsvError, parse, type Info } from 'csv-parse/sync';
import { fileTypeFromBuffer } from 'file-type';
import { ATTACHMENT_KIND_LABELS, ATTACHMENT_TYPES, MAX_SERIAL_FILE_BYTES, type AttachmentKind } from '../../shared/schemas/receiving';
import { parseSerialCells, type SerialList } from '../../shared/serials';
import { AppError, badRequest } from '../http/errors';

export type UploadedFile = { originalname: string; buffer: Buffer; size: number };
export type CheckedDocument = { kind: AttachmentKind; name: string; mediaType: (typeof ATTACHMENT_TYPES)[number]; data: Buffer };

/** Sniffs each document: only PDF, PNG and JPEG content is kept, whatever the file is called. */
export async function checkDocuments(files: Partial<Record<AttachmentKind, UploadedFile[]>>): Promise<CheckedDocument[]> {
  const checked: CheckedDocument[] = [];
  const refused: { file: string; message: string }[] = [];
  for (const [kind, list] of Object.entries(files) as [AttachmentKind, UploadedFile[] | undefined][]) {
    for (const file of list ?? []) {
      const type = await fileTypeFromBuffer(file.buffer);
      const mediaType = ATTACHMENT_TYPES.find((t) => t === type?.mime);
      if (file.size === 0) refused.push({ file: file.originalname, message: `${file.originalname} is empty` });
      else if (!mediaType) {
        refused.push({
          file: file.originalname,
          message: `${ATTACHMENT_KIND_LABELS[kind]} ${file.originalname} is not a PDF, PNG or JPEG${type ? ` (its content is ${type.mime})` : ''}`,
        });
      } else checked.push({ kind, name: file.originalname.slice(0, 255), mediaType, data: file.buffer });
    }
  }
  if (refused.length) throw new AppError(415, 'unsupported_file', refused.map((r) => r.message).join('; '), refused);
  return checked;
}

/** Reads serial numbers from a CSV: the column headed "serial…" if there is a header, else the first. */
export function readSerialFile(file: UploadedFile): SerialList {
  if (file.size > MAX_SERIAL_FILE_BYTES) throw badRequest(`The serial file ${file.originalname} is larger than 2 MB`);
  if (file.buffer.includes(0)) throw badRequest(`The serial file ${file.originalname} is not a text (CSV) file`);
  let rows: { record: string[]; info: Info }[];
  try {
    // With `info: true` each record comes with the line it ends on; the typings do not say so.
    rows = parse(file.buffer, { info: true, bom: true, trim: true, skip_empty_lines: true, relax_column_count: true }) as unknown as typeof rows;
  } catch (error) {
    if (error instanceof CsvError) {
      throw badRequest(`The serial file ${file.originalname} cannot be read as CSV`, [{ line: error.lines, message: error.message.replace(/^[^:]*: /, '') }]);
    }
    throw error;
  }
  if (rows.length === 0) throw badRequest(`The serial file ${file.originalname} holds no serial numbers`);
  const headerColumn = rows[0].record.findIndex((cell) => /^serial/i.test(cell));
  const column = headerColumn >= 0 ? headerColumn : 0;
  const data = headerColumn >= 0 ? rows.slice(1) : rows;
  return parseSerialCells(data.map(({ record, info }) => ({ value: record[column] ?? '', line: info.lines })));
}
