/**
 * A PDF's text page by page, one line per baseline in reading order, read back with pdfjs-dist
 * (a general-purpose PDF reader, independent of pdfmake).
 */
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

export async function pageLines(bytes: Uint8Array): Promise<string[][]> {
  const doc = await getDocument({ data: new Uint8Array(bytes) }).promise;
  const pages: string[][] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const content = await (await doc.getPage(n)).getTextContent();
    const lines = new Map<number, { x: number; str: string }[]>();
    for (const raw of content.items) {
      if (!('str' in raw) || !raw.str.trim()) continue;
      const y = raw.transform[5] as number;
      const key = [...lines.keys()].find((k) => Math.abs(k - y) < 1.5) ?? y;
      lines.set(key, [...(lines.get(key) ?? []), { x: raw.transform[4] as number, str: raw.str }]);
    }
    pages.push(
      [...lines.entries()]
        .sort((a, b) => b[0] - a[0])
        .map(([, l]) =>
          l
            .sort((a, b) => a.x - b.x)
            .map((i) => i.str)
            .join(' ')
            .replace(/\s+/g, ' ')
            .trim(),
        ),
    );
  }
  await doc.destroy();
  return pages;
}
