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

/** The grey of small print (footers, captions) on every document. */
export const MUTED = '#5b645f';

/** "<footer>" and "page i of n" at the foot of every page, once the page count is known (needs bufferPages). */
export function numberPages(doc: PDFKit.PDFDocument, footer: string, left: number, width: number) {
  const range = doc.bufferedPageRange();
  for (let i = 0; i < range.count; i++) {
    doc.switchToPage(range.start + i);
    // Writing inside the bottom margin would otherwise make pdfkit open a new page.
    doc.page.margins.bottom = 0;
    const footerY = doc.page.height - 40;
    doc.font('body').fontSize(7.5).fillColor(MUTED);
    doc.text(footer, left, footerY, { width: width / 2, lineBreak: false });
    doc.text(`page ${i + 1} of ${range.count}`, left + width / 2, footerY, { width: width / 2, align: 'right', lineBreak: false });
  }
}
