import type { Response } from 'supertest';

/** supertest parser that keeps a binary body (a PDF) as a Buffer. */
export function binaryBody(res: Response, callback: (error: Error | null, body: Buffer) => void): void {
  const parts: Buffer[] = [];
  res.on('data', (c: Buffer) => parts.push(c));
  res.on('end', () => callback(null, Buffer.concat(parts)));
}

async function open(bytes: Buffer) {
  const { getDocument } = await import('pdfjs-dist/legacy/build/pdf.mjs');
  return getDocument({ data: new Uint8Array(bytes), verbosity: 0 }).promise;
}

/** A PDF's text as pdfjs-dist extracts it: text runs joined by single spaces, pages by new lines (a wrapped line reads as one). */
export async function pdfText(bytes: Buffer): Promise<string> {
  const pdf = await open(bytes);
  const pages: string[] = [];
  for (let i = 1; i <= pdf.numPages; i++) {
    const content = await (await pdf.getPage(i)).getTextContent();
    pages.push(content.items.map((it) => ('str' in it ? it.str : '')).join(' ').replace(/\s+/g, ' '));
  }
  return pages.join('\n');
}

/** How many images the PDF paints, counted from pdfjs-dist's operator lists. */
export async function pdfImageCount(bytes: Buffer): Promise<number> {
  const { OPS } = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const pdf = await open(bytes);
  const imageOps = new Set<number>([OPS.paintImageXObject, OPS.paintInlineImageXObject, OPS.paintImageXObjectRepeat]);
  let count = 0;
  for (let i = 1; i <= pdf.numPages; i++) {
    const ops = await (await pdf.getPage(i)).getOperatorList();
    count += ops.fnArray.filter((fn) => imageOps.has(fn)).length;
  }
  return count;
}
