/**
 * The words of terminal readings in a unit system: flows in cfm or L/s, velocities in fpm or m/s,
 * effective areas in ft² or m², densities, temperatures and barometric pressure as the rest of the
 * app shows them. Framework-free.
 */
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import type { QuantityFormat } from "./reading";

export function quantityFormat(units: UnitSystem): QuantityFormat {
  return {
    flow: (v) => formatQuantity(units, "flow", v),
    velocity: (v) => formatQuantity(units, "velocity", v),
    area: (v) => formatIn(FORM_UNITS[units].area, v, 4),
    density: (v) => formatQuantity(units, "density", v),
    temperature: (v) => formatQuantity(units, "temperature", v),
    barometric: (v) => formatQuantity(units, "barometric", v),
  };
}
