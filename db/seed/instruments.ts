import { and, eq, inArray } from "drizzle-orm";
import * as s from "../schema";
import type { Tx } from "./index";

/**
 * The demo crew's kit and the conditions the demo readings were taken under. Makers, models, serial
 * and certificate numbers are invented. Dates are fixed around the demo readings of 24 Nov 2026: the
 * thermal anemometer falls due in mid-December, the vane anemometer is past due, and the clamp meter
 * has no calibration on record, so every calibration status shows somewhere.
 */
export const DEMO_INSTRUMENTS = [
  {
    kind: "manometer",
    make: "Halvard Instruments",
    model: "HM-640",
    serial: "MM-30418",
    certificateNumber: "HLC-26-05117",
    calibratedOn: "2026-05-12",
    calibrationDueOn: "2027-05-12",
    rangeMin: -3735,
    rangeMax: 3735,
    accuracyPct: 1,
    accuracyFloor: 1,
  },
  {
    kind: "pitot_tube",
    make: "Corvane",
    model: "PS-900",
    serial: "PT-0931",
    certificateNumber: "",
    calibratedOn: "2026-01-20",
    calibrationDueOn: "2027-01-20",
    rangeMax: 900,
    probeCoefficient: 1.0,
    probeHeadDiameterMm: 8,
    notes: "Standard ellipsoidal-nose tube; inspected for dents and blocked holes at each calibration.",
  },
  {
    kind: "pitot_tube",
    make: "Corvane",
    model: "PS-1500",
    serial: "PT-1522",
    certificateNumber: "",
    calibratedOn: "2026-01-20",
    calibrationDueOn: "2027-01-20",
    rangeMax: 1500,
    probeCoefficient: 1.0,
    probeHeadDiameterMm: 8,
  },
  {
    kind: "capture_hood",
    make: "Tessic",
    model: "AH-12",
    serial: "CH-7710",
    certificateNumber: "TSC-4471",
    calibratedOn: "2026-02-03",
    calibrationDueOn: "2027-02-03",
    rangeMin: 0.012,
    rangeMax: 0.94,
    accuracyPct: 3,
    accuracyFloor: 0.0033,
    hoodCorrectionFactor: 1.0,
    notes: "600 × 600 mm top fitted; other tops in the case.",
  },
  {
    kind: "thermal_anemometer",
    make: "Tessic",
    model: "TA-3",
    serial: "TA-5521",
    certificateNumber: "TSC-3902",
    calibratedOn: "2025-12-14",
    calibrationDueOn: "2026-12-14",
    rangeMin: 0,
    rangeMax: 30,
    accuracyPct: 3,
    accuracyFloor: 0.015,
  },
  {
    kind: "vane_anemometer",
    make: "Corvane",
    model: "VA-100",
    serial: "VA-7702",
    certificateNumber: "CVL-25-0880",
    calibratedOn: "2025-08-20",
    calibrationDueOn: "2026-10-01",
    rangeMin: 0.3,
    rangeMax: 30,
    accuracyPct: 2,
    accuracyFloor: 0.1,
    notes: "Sent for calibration late; booked with the laboratory for December.",
  },
  {
    kind: "thermo_hygrometer",
    make: "Halvard Instruments",
    model: "HT-20",
    serial: "TH-2209",
    certificateNumber: "HLC-26-06031",
    calibratedOn: "2026-06-02",
    calibrationDueOn: "2027-06-02",
    rangeMin: -20,
    rangeMax: 60,
    accuracyFloor: 0.3,
    humidityAccuracyPct: 2,
  },
  {
    kind: "barometer",
    make: "Halvard Instruments",
    model: "HB-5",
    serial: "BA-1174",
    certificateNumber: "HLC-26-04102",
    calibratedOn: "2026-04-08",
    calibrationDueOn: "2027-04-08",
    rangeMin: 70_000,
    rangeMax: 110_000,
    accuracyFloor: 150,
  },
  {
    kind: "tachometer",
    make: "Tessic",
    model: "OT-2",
    serial: "TC-4410",
    certificateNumber: "TSC-2210",
    calibratedOn: "2026-03-01",
    calibrationDueOn: "2028-03-01",
    rangeMin: 10,
    rangeMax: 99_999,
    accuracyPct: 0.02,
    accuracyFloor: 1,
  },
  {
    kind: "clamp_meter",
    make: "Halvard Instruments",
    model: "HC-400",
    serial: "CM-8836",
    certificateNumber: "",
    calibratedOn: null,
    calibrationDueOn: null,
    rangeMin: 0,
    rangeMax: 400,
    accuracyPct: 2,
    accuracyFloor: 0.5,
    notes: "Bought second-hand; calibration certificate not found.",
  },
] as const satisfies readonly (Omit<typeof s.instruments.$inferInsert, "kind"> & { kind: s.InstrumentKind })[];

/**
 * Adds the instrument register, records operating conditions for the library's systems (an earlier
 * set before the fan sheave was adjusted, and the set the demo traverses were read under), and links
 * the demo traverses to both.
 */
export async function seedFieldKit(tx: Tx, { projectId, technicianId }: { projectId: string; technicianId: string }) {
  const instruments = await tx
    .insert(s.instruments)
    .values(DEMO_INSTRUMENTS.map((i) => ({ ...i, createdBy: technicianId })))
    .returning();
  const bySerial = (serial: string) => instruments.find((i) => i.serial === serial)!.id;

  const systems = await tx.select().from(s.airSystems).where(eq(s.airSystems.projectId, projectId));
  const ahu = systems.find((x) => x.tag === "AHU-1");
  const ef = systems.find((x) => x.tag === "EF-1");
  if (!ahu || !ef) return;

  const [, ahuNow] = await tx
    .insert(s.operatingConditions)
    .values([
      {
        systemId: ahu.id,
        fanSpeedRpm: 1100,
        boxes: "none",
        outsideAirDamperPct: 35,
        filterState: "part_loaded",
        notes: "As found, before the fan sheave was adjusted and the filters changed.",
        recordedBy: technicianId,
        recordedAt: new Date("2026-11-23T15:10:00Z"),
      },
      {
        systemId: ahu.id,
        fanSpeedRpm: 1150,
        boxes: "none",
        outsideAirDamperPct: 20,
        filterState: "clean",
        notes: "Economizer held at its minimum position from the building controls for the tests; new filters fitted.",
        recordedBy: technicianId,
        recordedAt: new Date("2026-11-24T09:25:00Z"),
      },
    ])
    .returning();
  await tx.insert(s.operatingConditions).values({
    systemId: ef.id,
    fanSpeedRpm: 1420,
    boxes: "none",
    filterState: "unknown",
    notes: "No filters on this fan; washroom doors closed.",
    recordedBy: technicianId,
    recordedAt: new Date("2026-11-24T11:50:00Z"),
  });

  const ahuSections = await tx.select({ id: s.ductSections.id }).from(s.ductSections).where(eq(s.ductSections.systemId, ahu.id));
  await tx
    .update(s.traverses)
    .set({
      instrumentId: bySerial("MM-30418"),
      probeInstrumentId: bySerial("PT-0931"),
      airInstrumentId: bySerial("TH-2209"),
      conditionsId: ahuNow!.id,
    })
    .where(and(inArray(s.traverses.sectionId, ahuSections.map((x) => x.id))));
}
