import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";

export interface PageText {
  width: number;
  height: number;
  text: string;
  items: { str: string; x: number; y: number; width: number; rotated: boolean }[];
}

/** Every page's text and where each run sits (PDF points, origin bottom-left), read back with pdf.js. */
export async function readPdfText(bytes: Uint8Array): Promise<PageText[]> {
  const doc = await getDocument({ data: Uint8Array.from(bytes), disableFontFace: true, useSystemFonts: false, isEvalSupported: false }).promise;
  const pages: PageText[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n);
    const [, , width, height] = page.view as [number, number, number, number];
    const content = await page.getTextContent();
    const items = content.items
      .filter((i): i is Extract<typeof i, { str: string }> => "str" in i)
      .map((i) => ({ str: i.str, x: i.transform[4] as number, y: i.transform[5] as number, width: i.width, rotated: Math.abs(i.transform[1] as number) > 1e-6 }));
    pages.push({ width, height, text: items.map((i) => i.str).join(" ").replace(/\s+/g, " "), items });
  }
  await doc.destroy();
  return pages;
}
