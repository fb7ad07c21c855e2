// Text of a PDF, read back with pdfjs-dist (a general-purpose PDF reader), one string per page.
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

export async function pdfPages(pdf: Buffer): Promise<string[]> {
  const document = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, isEvalSupported: false }).promise;
  const pages: string[] = [];
  for (let n = 1; n <= document.numPages; n++) {
    const content = await (await document.getPage(n)).getTextContent();
    pages.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  await document.destroy();
  return pages;
}
