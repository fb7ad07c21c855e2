// A pdfkit document with the DejaVu fonts shipped in fonts/ (so λ, °, ± and µ always print) and its
// bytes collected into one Buffer when it ends.
import PDFDocument from 'pdfkit';
import { join, resolve } from 'node:path';

const FONTS = resolve(import.meta.dirname, '../../fonts');

export function openPdf(options: PDFKit.PDFDocumentOptions) {
  const doc = new PDFDocument(options);
  doc.registerFont('body', join(FONTS, 'DejaVuSans.ttf'));
  doc.registerFont('bold', join(FONTS, 'DejaVuSans-Bold.ttf'));
  doc.registerFont('mono', join(FONTS, 'DejaVuSansMono.ttf'));
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const bytes = new Promise<Buffer>((done) => doc.on('end', () => done(Buffer.concat(chunks))));
  return { doc, bytes };
}
