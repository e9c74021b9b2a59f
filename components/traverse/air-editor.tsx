"use client";

/**
 * The air at the plane on the traverse screen, typed in the user's units. A change reaches the
 * traverse (and the live numbers) only once the whole set is valid, so a half-typed value never holds
 * the readings back from the server; what is wrong is said beside the field.
 */
import { useId, useState } from "react";
import { ChoiceGroup } from "@/components/ui/choice-group";
import { QuantityField } from "@/components/ui/quantity-field";
import type { DraftAir } from "@/lib/api-client/traverses";
import { barometricPressureFromAltitudePa } from "@/lib/airflow/air";
import { displayUnit, formatQuantity, fromDisplay, toDisplay, type Quantity, type UnitSystem } from "@/lib/units";
import { parseDecimal } from "@/lib/validation/decimal";
import { zodFieldErrors } from "@/lib/validation/result";
import { traverseAirSchema } from "@/lib/validation/traverses";

interface Texts {
  dryBulb: string;
  humidity: "rh" | "wb";
  rh: string;
  wetBulb: string;
  staticPressure: string;
  barometric: string;
}

function shown(units: UnitSystem, q: Quantity, si: number | null): string {
  if (si === null) return "";
  return String(Number(toDisplay(units, q, si).toFixed(displayUnit(units, q).decimals + 1)));
}

export function AirEditor({ air, units, altitudeM, onChange }: { air: DraftAir | null; units: UnitSystem; altitudeM: number; onChange: (air: DraftAir) => void }) {
  const id = useId();
  const [t, setT] = useState<Texts>(() => ({
    dryBulb: shown(units, "temperature", air?.dryBulbC ?? null),
    humidity: air?.wetBulbC !== null && air?.wetBulbC !== undefined && air.relativeHumidityPct === null ? "wb" : "rh",
    rh: air?.relativeHumidityPct === null || air?.relativeHumidityPct === undefined ? "" : String(air.relativeHumidityPct),
    wetBulb: shown(units, "temperature", air?.wetBulbC ?? null),
    staticPressure: shown(units, "pressure", air?.staticPa ?? null),
    barometric: shown(units, "barometric", air?.barometricPa ?? null),
  }));
  const [errors, setErrors] = useState<Record<string, string>>({});

  const update = (patch: Partial<Texts>) => {
    const next = { ...t, ...patch };
    setT(next);
    const errs: Record<string, string> = {};
    const num = (text: string, field: string, q: Quantity | null) => {
      const n = parseDecimal(text);
      if (n === "invalid") {
        errs[field] = `must be a number; got "${text.trim()}"`;
        return null;
      }
      return n === null ? null : q ? fromDisplay(units, q, n) : n;
    };
    const candidate = {
      dryBulbC: num(next.dryBulb, "air.dryBulbC", "temperature"),
      relativeHumidityPct: next.humidity === "rh" ? num(next.rh, "air.relativeHumidityPct", null) : null,
      wetBulbC: next.humidity === "wb" ? num(next.wetBulb, "air.wetBulbC", "temperature") : null,
      staticPa: num(next.staticPressure, "air.staticPa", "pressure"),
      barometricPa: num(next.barometric, "air.barometricPa", "barometric"),
    };
    const parsed = traverseAirSchema.safeParse(candidate);
    const all = { ...(parsed.success ? {} : zodFieldErrors(parsed.error)), ...errs };
    setErrors(all);
    if (Object.keys(all).length === 0) onChange(candidate as DraftAir);
  };

  const field = (name: keyof Omit<Texts, "humidity">, apiField: string, label: string, unit: string, hint?: string) => {
    const fid = `${id}-${name}`;
    const error = errors[apiField];
    return <QuantityField id={fid} label={label} unit={unit} value={t[name]} onValue={(text) => update({ [name]: text })} hint={hint} error={error} />;
  };

  return (
    <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
      {field("dryBulb", "air.dryBulbC", "Dry-bulb", displayUnit(units, "temperature").symbol)}
      <ChoiceGroup legend="Humidity as" name="air-humidity" choices={[{ value: "rh", label: "Relative humidity" }, { value: "wb", label: "Wet-bulb" }]} value={t.humidity} onChange={(h) => update({ humidity: h })} />
      {t.humidity === "rh" ? field("rh", "air.relativeHumidityPct", "Relative humidity", "%") : field("wetBulb", "air.wetBulbC", "Wet-bulb", displayUnit(units, "temperature").symbol)}
      {field(
        "staticPressure",
        "air.staticPa",
        "Duct static pressure",
        displayUnit(units, "pressure").symbol,
        t.staticPressure.trim() === "" ? "Not measured: 0 is assumed and the result says so." : "Gauge, at the plane.",
      )}
      {field("barometric", "air.barometricPa", "Barometric pressure", displayUnit(units, "barometric").symbol, `Empty: ${formatQuantity(units, "barometric", barometricPressureFromAltitudePa(altitudeM))} from the site altitude.`)}
    </div>
  );
}
