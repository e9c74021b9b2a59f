import type { DuctSection } from "@/db/schema";
import { formatQuantity, type UnitSystem } from "@/lib/units";

/** "Ø 630 mm" or "1200 × 600 mm" (or inches), as a technician writes it on the duct. */
export function ductSize(section: Pick<DuctSection, "shape" | "diameterMm" | "widthMm" | "heightMm">, system: UnitSystem): string {
  if (section.shape === "round") return `Ø ${formatQuantity(system, "dimension", section.diameterMm ?? 0)}`;
  const w = formatQuantity(system, "dimension", section.widthMm ?? 0, { withUnit: false });
  return `${w} × ${formatQuantity(system, "dimension", section.heightMm ?? 0)}`;
}

export function pct(value: number | null, decimals = 0): string {
  return value === null ? "—" : `${value.toFixed(decimals)} %`;
}
