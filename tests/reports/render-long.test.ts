import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { renderReport } from "@/lib/report/render";
import { geometryFor } from "@/lib/report/pdf-kit";
import { longModel } from "../support/report-model";
import { readPdfText } from "./pdf-text";

describe("a long report", () => {
  it("paginates every table and wraps every text with nothing past the margins or into the footer", async () => {
    const pdf = await renderReport(longModel(), { documentDate: new Date("2026-12-01T10:00:00Z") });
    expect((await PDFDocument.load(pdf)).getPageCount()).toBeGreaterThan(60);
    const pages = await readPdfText(pdf);
    const geo = geometryFor("IP");
    pages.forEach((page, i) => {
      expect(page.width).toBeCloseTo(geo.width, 0);
      expect(page.text).toContain(`Page ${i + 1} of ${pages.length}`);
      for (const item of page.items) {
        if (item.str.trim() === "") continue;
        const where = `page ${i + 1}: "${item.str}" at (${item.x.toFixed(1)}, ${item.y.toFixed(1)}), width ${item.width.toFixed(1)}`;
        expect(item.x, where).toBeGreaterThanOrEqual(geo.left - 0.5);
        expect(item.x + item.width, where).toBeLessThanOrEqual(geo.right + 0.5);
        expect(item.y, where).toBeLessThanOrEqual(geo.height - 30);
        // Body text stays above the footer rule; the footer's own lines sit below it.
        const inFooter = item.y < geo.bottom - 14;
        expect(inFooter || item.y >= geo.bottom - 12, where).toBe(true);
      }
    });
  }, 120_000);

  it("gives the same bytes for the same model and document date", async () => {
    const model = longModel();
    model.traverses = model.traverses.slice(0, 1);
    model.systems = model.systems.slice(0, 1);
    const date = new Date("2026-12-01T10:00:00Z");
    const a = await renderReport(model, { documentDate: date });
    const b = await renderReport(model, { documentDate: date });
    expect(Buffer.from(a).equals(Buffer.from(b))).toBe(true);
  });
});
