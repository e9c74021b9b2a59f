import { FORM_UNITS } from "@/lib/design/quantities";
import * as s from "../schema";
import type { Tx } from "./index";

/**
 * The inch-pound demo: an invented clinic fit-out scheduled the way a US engineer writes it, in whole
 * inches and round cfm. Values are stored in SI, converted from those round inch-pound figures, so the
 * screens show them back exactly as scheduled. Every tag, room and number here is made up.
 */
const IP = FORM_UNITS.IP;
const cfm = (v: number) => IP.flow.toSi(v);
const inch = (v: number) => IP.dimension.toSi(v);
const ft = (v: number) => IP.run.toSi(v);
const inWc = (v: number) => IP.pressure.toSi(v);
const ft2 = (v: number) => IP.area.toSi(v);
const hp = (v: number) => IP.power.toSi(v);

/** Standard air as US practice states it: 0.075 lb/ft³. */
export const CLINIC_STANDARD_DENSITY_KG_M3 = IP.density.toSi(0.075);
/** 115 ft above sea level. */
export const CLINIC_ALTITUDE_M = IP.altitude.toSi(115);

export async function seedClinic(tx: Tx, projectId: string) {
  const [rtu] = await tx
    .insert(s.airSystems)
    .values({
      projectId,
      tag: "RTU-2",
      name: "Consulting suites supply",
      kind: "supply",
      designFlowM3S: cfm(2400),
      designStaticPa: inWc(1.5),
      fanSpeedRpm: 1120,
      designOutsideAirM3S: cfm(480),
      motorPowerKw: hp(3),
      motorSpeedRpm: 1755,
      motorFullLoadAmps: 4.8,
      motorVolts: 460,
      motorPhases: 3,
      motorServiceFactor: 1.15,
      hasVfd: true,
      location: "Roof, above consulting suite 1",
    })
    .returning();
  const systemId = rtu!.id;
  const [trunk] = await tx
    .insert(s.ductSections)
    .values({
      systemId,
      tag: "C1",
      kind: "trunk",
      shape: "rectangular",
      widthMm: inch(24),
      heightMm: inch(16),
      designFlowM3S: cfm(2400),
      straightUpstreamMm: ft(10),
      straightDownstreamMm: ft(3),
      location: "Corridor ceiling, level 1, below the roof curb",
    })
    .returning();
  const [consult, waiting, treatment] = await tx
    .insert(s.ductSections)
    .values([
      { systemId, parentId: trunk!.id, tag: "C1.1", kind: "branch", shape: "round", diameterMm: inch(12), designFlowM3S: cfm(700), straightUpstreamMm: ft(8), straightDownstreamMm: ft(2), location: "Above consulting rooms 1–4, ahead of VAV-1" },
      { systemId, parentId: trunk!.id, tag: "C1.2", kind: "branch", shape: "round", diameterMm: inch(10), designFlowM3S: cfm(500), straightUpstreamMm: ft(6), straightDownstreamMm: ft(2), location: "Waiting room ceiling" },
      { systemId, parentId: trunk!.id, tag: "C1.3", kind: "branch", shape: "round", diameterMm: inch(14), designFlowM3S: cfm(1200), straightUpstreamMm: ft(9), straightDownstreamMm: ft(3), location: "Above treatment rooms 5–7, ahead of VAV-2" },
    ])
    .returning();
  const [consultOut, treatmentOut] = await tx
    .insert(s.ductSections)
    .values([
      { systemId, parentId: consult!.id, tag: "C1.1.1", kind: "branch", shape: "rectangular", widthMm: inch(16), heightMm: inch(10), designFlowM3S: cfm(700), straightUpstreamMm: ft(5), straightDownstreamMm: ft(1), location: "VAV-1 discharge, consulting rooms 1–4" },
      { systemId, parentId: treatment!.id, tag: "C1.3.1", kind: "branch", shape: "rectangular", widthMm: inch(20), heightMm: inch(10), designFlowM3S: cfm(1200), straightUpstreamMm: ft(5), straightDownstreamMm: ft(1), location: "VAV-2 discharge, treatment rooms 5–7" },
    ])
    .returning();

  const diffuser = (sectionId: string, tag: string, room: string, flowCfm: number, neckIn: number, device: string, akFt2?: number) => ({
    sectionId,
    tag,
    type: "diffuser" as const,
    service: "supply" as const,
    room,
    device,
    sizeShape: "round" as const,
    diameterMm: inch(neckIn),
    designFlowM3S: cfm(flowCfm),
    effectiveAreaM2: akFt2 === undefined ? null : ft2(akFt2),
  });
  const squareCone = "24×24 square-cone ceiling diffuser";
  await tx.insert(s.terminals).values([
    {
      sectionId: consult!.id,
      tag: "VAV-1",
      type: "vav_box",
      service: "supply",
      room: "Consulting rooms 1–4",
      device: "Single-duct VAV box, hot-water reheat",
      sizeShape: "round",
      diameterMm: inch(10),
      designFlowM3S: cfm(700),
      designMinFlowM3S: cfm(210),
      designHeatingFlowM3S: cfm(350),
      controllerFlowFactor: 0.87,
    },
    {
      sectionId: treatment!.id,
      tag: "VAV-2",
      type: "vav_box",
      service: "supply",
      room: "Treatment rooms 5–7",
      device: "Single-duct VAV box, hot-water reheat",
      sizeShape: "round",
      diameterMm: inch(12),
      designFlowM3S: cfm(1200),
      designMinFlowM3S: cfm(360),
      designHeatingFlowM3S: cfm(600),
      controllerFlowFactor: 0.91,
    },
    ...[1, 2, 3, 4].map((n) => diffuser(consultOut!.id, `SD-10${n}`, `Consulting room ${n}`, 175, 8, squareCone, 0.31)),
    ...[1, 2, 3, 4].map((n) => diffuser(waiting!.id, `SD-11${n}`, "Waiting room", 125, 8, squareCone, 0.31)),
    ...[1, 2, 3, 4, 5, 6].map((n) => diffuser(treatmentOut!.id, `SD-12${n}`, `Treatment room ${5 + Math.floor((n - 1) / 2)}`, 200, 10, "24×24 perforated-face diffuser")),
  ]);
}
