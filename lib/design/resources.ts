/**
 * The JSON the API answers with for the design side (camelCase, SI), and zod descriptions of it for the
 * API document. The terminals table keeps the kind of device in its `type` column; the API calls it `kind`.
 */
import "@/lib/validation/zod-browser";
import { z } from "zod";
import type { Terminal } from "@/db/schema";
import { AIR_SERVICES, DUCT_SHAPES, SYSTEM_KINDS, TERMINAL_KINDS, type TerminalKind } from "@/lib/validation/design";

export interface TerminalResource {
  id: string;
  sectionId: string;
  tag: string;
  kind: TerminalKind;
  service: (typeof AIR_SERVICES)[number];
  room: string;
  device: string;
  sizeShape: (typeof DUCT_SHAPES)[number] | null;
  diameterMm: number | null;
  widthMm: number | null;
  heightMm: number | null;
  designFlowM3S: number;
  designMinFlowM3S: number | null;
  designHeatingFlowM3S: number | null;
  effectiveAreaM2: number | null;
  controllerFlowFactor: number | null;
  createdAt: Date;
}

export function terminalResource(t: Terminal): TerminalResource {
  return {
    id: t.id,
    sectionId: t.sectionId,
    tag: t.tag,
    kind: t.type,
    service: t.service,
    room: t.room,
    device: t.device,
    sizeShape: t.sizeShape,
    diameterMm: t.diameterMm,
    widthMm: t.widthMm,
    heightMm: t.heightMm,
    designFlowM3S: t.designFlowM3S,
    designMinFlowM3S: t.designMinFlowM3S,
    designHeatingFlowM3S: t.designHeatingFlowM3S,
    effectiveAreaM2: t.effectiveAreaM2,
    controllerFlowFactor: t.controllerFlowFactor,
    createdAt: t.createdAt,
  };
}

const num = z.number();
const maybe = num.nullable();
const when = z.string().describe("ISO 8601 date-time");

export const projectResourceSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  siteName: z.string(),
  address: z.string(),
  altitudeM: num,
  unitSystem: z.enum(["IP", "SI"]),
  standardDensityKgM3: num,
  fanToleranceMinusPct: num,
  fanTolerancePlusPct: num,
  sectionToleranceMinusPct: num,
  sectionTolerancePlusPct: num,
  outletToleranceMinusPct: num,
  outletTolerancePlusPct: num,
  terminalUnitToleranceMinusPct: num,
  terminalUnitTolerancePlusPct: num,
  outsideAirToleranceMinusPct: num,
  outsideAirTolerancePlusPct: num,
  continuityTolerancePct: num,
  samplePct: num.describe("verification sample: share of each kind drawn, %"),
  sampleMinCount: num.describe("verification sample: fewest items drawn"),
  sampleTolerancePct: num.describe("verification sample: agreement tolerance, ± %"),
  sampleAllowedFailures: num.describe("verification sample: disagreements allowed before returning the system is recommended"),
  createdAt: when,
});

export const systemResourceSchema = z.object({
  id: z.uuid(),
  projectId: z.uuid(),
  tag: z.string(),
  name: z.string(),
  kind: z.enum(SYSTEM_KINDS),
  location: z.string(),
  designFlowM3S: num.describe("m³/s at standard air"),
  designStaticPa: maybe,
  fanSpeedRpm: maybe,
  designOutsideAirM3S: maybe,
  motorPowerKw: maybe,
  motorSpeedRpm: maybe,
  motorFullLoadAmps: maybe,
  motorVolts: maybe,
  motorPhases: z.union([z.literal(1), z.literal(3)]).nullable(),
  motorServiceFactor: maybe,
  hasVfd: z.boolean(),
  createdAt: when,
});

export const sectionResourceSchema = z.object({
  id: z.uuid(),
  systemId: z.uuid(),
  parentId: z.uuid().nullable().describe("The section upstream; null for a trunk leaving the fan"),
  tag: z.string(),
  kind: z.enum(["trunk", "branch"]).describe("trunk when it has no parent, branch otherwise"),
  shape: z.enum(DUCT_SHAPES),
  diameterMm: maybe,
  widthMm: maybe,
  heightMm: maybe,
  designFlowM3S: num,
  straightUpstreamMm: maybe,
  straightDownstreamMm: maybe,
  location: z.string(),
  createdAt: when,
});

export const terminalResourceSchema = z.object({
  id: z.uuid(),
  sectionId: z.uuid(),
  tag: z.string(),
  kind: z.enum(TERMINAL_KINDS).describe("Outlets and inlets: diffuser, grille, register. Terminal units: vav_box, constant_volume_box"),
  service: z.enum(AIR_SERVICES),
  room: z.string(),
  device: z.string(),
  sizeShape: z.enum(DUCT_SHAPES).nullable().describe("Neck (outlets) or inlet (terminal units) shape; null when not known"),
  diameterMm: maybe,
  widthMm: maybe,
  heightMm: maybe,
  designFlowM3S: num.describe("Design airflow; the design maximum of a terminal unit"),
  designMinFlowM3S: maybe,
  designHeatingFlowM3S: maybe,
  effectiveAreaM2: maybe.describe("The maker's effective-area factor (Ak) of an outlet, m²"),
  controllerFlowFactor: maybe.describe("The terminal unit controller's flow factor as configured"),
  createdAt: when,
});

export const fieldDataHeldSchema = z.object({
  traverses: z.number().int(),
  traversedSections: z.array(z.string()),
  terminalReadings: z.number().int(),
  readTerminals: z.array(z.string()),
  terminalSets: z.number().int(),
  operatingConditions: z.number().int(),
});

export const deletedSchema = z.object({
  deleted: z.object({ systems: z.array(z.string()), sections: z.array(z.string()), terminals: z.array(z.string()) }).describe("Tags of what was removed"),
});
