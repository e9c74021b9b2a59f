import { PDFDocument, StandardFonts } from "pdf-lib";

/** A small real PDF (two pages of text) to issue in tests. */
export async function makeTestPdf(title = "Test closeout report"): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const font = await doc.embedFont(StandardFonts.Helvetica);
  for (let n = 1; n <= 2; n++) {
    const page = doc.addPage([595, 842]);
    page.drawText(`${title} — page ${n} of 2`, { x: 50, y: 780, size: 14, font });
  }
  // Fixed dates keep the bytes reproducible for one title.
  doc.setCreationDate(new Date("2026-01-01T00:00:00Z"));
  doc.setModificationDate(new Date("2026-01-01T00:00:00Z"));
  return doc.save();
}
