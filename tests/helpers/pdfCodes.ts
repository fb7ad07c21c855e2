// The 2-D codes printed on a PDF's pages, read back as a scanner would: each page's images are taken
// out with pdfjs-dist (a general-purpose PDF reader) and decoded with ZXing's Data Matrix and QR
// readers (@zxing/library), one list of decoded texts per page.
import { getDocument, OPS } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { BarcodeFormat, BinaryBitmap, DecodeHintType, HybridBinarizer, MultiFormatReader, RGBLuminanceSource } from '@zxing/library';

type PdfImage = { width: number; height: number; kind: number; data: Uint8Array | Uint8ClampedArray };

/** Grey levels of an image in pdfjs's layouts (1: 1 bit per pixel, 2: RGB, 3: RGBA), on a white border of `pad` pixels. */
function luminance(image: PdfImage, pad: number) {
  const width = image.width + 2 * pad;
  const height = image.height + 2 * pad;
  const grey = new Uint8ClampedArray(width * height).fill(255);
  const channels = image.kind === 3 ? 4 : 3;
  for (let y = 0; y < image.height; y++)
    for (let x = 0; x < image.width; x++) {
      let value: number;
      if (image.kind === 1) {
        const rowBytes = (image.width + 7) >> 3;
        value = image.data[y * rowBytes + (x >> 3)] & (0x80 >> (x & 7)) ? 255 : 0;
      } else {
        const i = (y * image.width + x) * channels;
        value = (image.data[i] * 299 + image.data[i + 1] * 587 + image.data[i + 2] * 114) / 1000;
      }
      grey[(y + pad) * width + x + pad] = value;
    }
  return { grey, width, height };
}

function decode(image: PdfImage): string {
  const { grey, width, height } = luminance(image, 16);
  const reader = new MultiFormatReader();
  reader.setHints(
    new Map<DecodeHintType, unknown>([
      [DecodeHintType.POSSIBLE_FORMATS, [BarcodeFormat.DATA_MATRIX, BarcodeFormat.QR_CODE]],
      [DecodeHintType.TRY_HARDER, true],
    ]),
  );
  return reader.decode(new BinaryBitmap(new HybridBinarizer(new RGBLuminanceSource(grey, width, height)))).getText();
}

export async function pdfCodes(pdf: Buffer): Promise<string[][]> {
  const document = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, isEvalSupported: false, isOffscreenCanvasSupported: false }).promise;
  const pages: string[][] = [];
  for (let n = 1; n <= document.numPages; n++) {
    const page = await document.getPage(n);
    const operators = await page.getOperatorList();
    const names = operators.fnArray.flatMap((fn, index) => (fn === OPS.paintImageXObject ? [operators.argsArray[index][0] as string] : []));
    // An image's pixels arrive from the reader's worker after the operator list: wait for each.
    const images = await Promise.all(names.map((name) => new Promise<PdfImage>((resolve) => page.objs.get(name, resolve))));
    pages.push(images.map(decode));
  }
  await document.destroy();
  return pages;
}
