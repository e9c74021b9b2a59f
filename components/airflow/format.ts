import type { DuctSection } from "@/db/schema";
import { formatQuantity, type UnitSystem } from "@/lib/units";

/** Whole inches or millimetres lose their ".0": a duct scheduled 24 × 16 in. reads that way. */
function dimension(system: UnitSystem, mm: number, withUnit: boolean): string {
  return formatQuantity(system, "dimension", mm, { withUnit }).replace(/\.0+(?=\s|$)/, "");
}

/** "Ø 630 mm" or "1200 × 600 mm" (or "24 × 16 in."), as a technician writes it on the duct. */
export function ductSize(section: Pick<DuctSection, "shape" | "diameterMm" | "widthMm" | "heightMm">, system: UnitSystem): string {
  if (section.shape === "round") return `Ø ${dimension(system, section.diameterMm ?? 0, true)}`;
  return `${dimension(system, section.widthMm ?? 0, false)} × ${dimension(system, section.heightMm ?? 0, true)}`;
}

export function pct(value: number | null, decimals = 0): string {
  return value === null ? "—" : `${value.toFixed(decimals)} %`;
}
