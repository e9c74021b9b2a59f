import "server-only";
import { getProjectDesign, listTraversesForProject, type ProjectDesign, type StoredTraverse } from "@/db/queries/airflow";
import type { AirSystem, DuctSection, Project } from "@/db/schema";
import { fanSpeedForFlow, proportionalBalance, withinTolerance, type BranchPlan } from "@/lib/airflow/balancing";
import { toleranceFor } from "@/lib/airflow/tolerance";
import { checkContinuity, type Junction } from "@/lib/airflow/network";
import { reduceTraverse, type TraverseResult } from "@/lib/airflow/traverse";
import type { Duct } from "@/lib/airflow/layout";

export type Reduction = { ok: true; result: TraverseResult } | { ok: false; message: string };

export function ductOf(section: Pick<DuctSection, "shape" | "diameterMm" | "widthMm" | "heightMm">): Duct {
  return section.shape === "round"
    ? { shape: "round", diameterM: (section.diameterMm ?? 0) / 1000 }
    : { shape: "rectangular", widthM: (section.widthMm ?? 0) / 1000, heightM: (section.heightMm ?? 0) / 1000 };
}

/** Runs the engine on a stored traverse; an incomplete one says what is still missing. */
export function reduceStoredTraverse(traverse: StoredTraverse, section: DuctSection, project: Project): Reduction {
  if (traverse.dryBulbC === null) return { ok: false, message: "Dry-bulb temperature not recorded yet." };
  if (traverse.relativeHumidityPct === null && traverse.wetBulbC === null)
    return { ok: false, message: "Relative humidity or wet-bulb not recorded yet." };
  const grid: (number | null)[][] = Array.from({ length: traverse.lines }, () => Array<number | null>(traverse.pointsPerLine).fill(null));
  for (const r of traverse.readings) {
    const row = grid[r.line - 1];
    if (row && r.point >= 1 && r.point <= traverse.pointsPerLine) row[r.point - 1] = r.value;
  }
  if (traverse.readings.length === 0) return { ok: false, message: "No readings yet." };
  try {
    const result = reduceTraverse({
      duct: ductOf(section),
      method: traverse.method,
      lines: traverse.lines,
      pointsPerLine: traverse.pointsPerLine,
      straightUpstreamM: section.straightUpstreamMm === null ? undefined : section.straightUpstreamMm / 1000,
      straightDownstreamM: section.straightDownstreamMm === null ? undefined : section.straightDownstreamMm / 1000,
      portOffsetM: traverse.portOffsetMm / 1000,
      air: {
        dryBulbC: traverse.dryBulbC,
        // The project's altitude always goes with a measured barometer, so a sea-level-corrected reading is caught.
        altitudeM: project.altitudeM,
        ...(traverse.barometricPa !== null ? { barometricPa: traverse.barometricPa } : {}),
        // Not recorded: the engine assumes 0 Pa and says so in its warnings and uncertainty.
        staticPa: traverse.staticPa ?? undefined,
        ...(traverse.relativeHumidityPct !== null
          ? { relativeHumidityPct: traverse.relativeHumidityPct }
          : { wetBulbC: traverse.wetBulbC ?? undefined }),
      },
      probeCoefficient: traverse.probeCoefficient,
      standardDensityKgM3: project.standardDensityKgM3,
      readings: grid,
      readingsKind: traverse.readingsKind,
    });
    return { ok: true, result };
  } catch (err) {
    return { ok: false, message: err instanceof Error ? err.message : "The readings could not be reduced." };
  }
}

export interface SectionView {
  section: DuctSection;
  depth: number;
  latest: StoredTraverse | null;
  reduction: Reduction | null;
  /** Measured standard flow as % of design (design airflow is taken at standard air). */
  pctOfDesign: number | null;
  withinTolerance: boolean | null;
}

export type JunctionView =
  | { parent: DuctSection; children: DuctSection[]; status: "checked"; junction: Junction }
  | { parent: DuctSection; children: DuctSection[]; status: "waiting"; missing: string[] };

/** Fan laws on today's readings: the speed that would bring the system to design, and what that costs. */
export interface FanAid {
  measuredFlowM3S: number;
  designFlowM3S: number;
  speedRpm: number;
  targetSpeedRpm: number;
  /** Pressure and power at the target speed as multiples of today's (fan laws: N², N³). */
  pressureFactor: number;
  powerFactor: number;
}

export interface SystemView {
  system: AirSystem;
  sections: SectionView[];
  junctions: JunctionView[];
  /** Branch-to-branch proportional balancing below each junction whose branches are all measured. */
  branchPlans: BranchPlan[];
  fan: FanAid | null;
}

/** Design against measurement for every system: per-section % of design and continuity by mass at each junction. */
export function buildAirflowView(project: Project, design: ProjectDesign, traverses: StoredTraverse[]): SystemView[] {
  const latestBySection = new Map<string, StoredTraverse>();
  for (const t of traverses) if (!latestBySection.has(t.sectionId)) latestBySection.set(t.sectionId, t);

  return design.systems.map((system) => {
    const sections = design.sections.filter((s) => s.systemId === system.id);
    const children = new Map<string | null, DuctSection[]>();
    for (const s of sections) children.set(s.parentId, [...(children.get(s.parentId) ?? []), s]);

    const views: SectionView[] = [];
    const byId = new Map<string, SectionView>();
    const visit = (section: DuctSection, depth: number) => {
      const latest = latestBySection.get(section.id) ?? null;
      const reduction = latest ? reduceStoredTraverse(latest, section, project) : null;
      const pct = reduction?.ok ? (100 * reduction.result.standardFlowM3S) / section.designFlowM3S : null;
      const view: SectionView = {
        section,
        depth,
        latest,
        reduction,
        pctOfDesign: pct,
        withinTolerance: reduction?.ok ? withinTolerance(reduction.result.standardFlowM3S, section.designFlowM3S, toleranceFor(project, "section")) : null,
      };
      views.push(view);
      byId.set(section.id, view);
      for (const child of children.get(section.id) ?? []) visit(child, depth + 1);
    };
    for (const root of children.get(null) ?? []) visit(root, 0);

    const junctions: JunctionView[] = [];
    for (const parent of sections) {
      const kids = children.get(parent.id) ?? [];
      if (kids.length === 0) continue;
      const members = [parent, ...kids];
      const missing = members.filter((m) => !byId.get(m.id)?.reduction?.ok).map((m) => m.tag);
      if (missing.length > 0) {
        junctions.push({ parent, children: kids, status: "waiting", missing });
        continue;
      }
      const node = (s: DuctSection, parentId: string | null) => {
        const r = byId.get(s.id)!.reduction as { ok: true; result: TraverseResult };
        return { id: s.id, parent: parentId, massFlowKgS: r.result.massFlowKgS, flowM3S: r.result.flowM3S, densityKgM3: r.result.densityKgM3 };
      };
      const { junctions: [junction] } = checkContinuity([node(parent, null), ...kids.map((k) => node(k, parent.id))], {
        tolerancePct: project.continuityTolerancePct,
        standardDensityKgM3: project.standardDensityKgM3,
      });
      junctions.push({ parent, children: kids, status: "checked", junction: junction! });
    }
    return { system, sections: views, junctions, branchPlans: branchPlans(sections, children, byId, project), fan: fanAid(system, children.get(null) ?? [], byId) };
  });
}

/** Loads a project's design and traverses and reduces them: one read of each table. */
export async function loadAirflowView(project: Project): Promise<SystemView[]> {
  const [design, traverses] = await Promise.all([getProjectDesign({ projectId: project.id }), listTraversesForProject({ projectId: project.id })]);
  return buildAirflowView(project, design, traverses);
}

function measuredStandardFlow(view: SectionView | undefined): number | null {
  return view?.reduction?.ok ? view.reduction.result.standardFlowM3S : null;
}

function branchPlans(sections: DuctSection[], children: Map<string | null, DuctSection[]>, byId: Map<string, SectionView>, project: Project): BranchPlan[] {
  const plans: BranchPlan[] = [];
  for (const parent of sections) {
    const kids = children.get(parent.id) ?? [];
    const flows = kids.map((k) => measuredStandardFlow(byId.get(k.id)));
    if (kids.length < 2 || flows.some((f) => f === null)) continue;
    const tolerance = toleranceFor(project, "section");
    const plan = proportionalBalance(
      kids.map((k, i) => ({ id: k.tag, branch: parent.tag, designM3S: k.designFlowM3S, measuredM3S: flows[i]! })),
      { tolerance },
    );
    plans.push(...plan.branches);
  }
  return plans;
}

function fanAid(system: AirSystem, roots: DuctSection[], byId: Map<string, SectionView>): FanAid | null {
  const flows = roots.map((r) => measuredStandardFlow(byId.get(r.id)));
  if (system.fanSpeedRpm === null || roots.length === 0 || flows.some((f) => f === null)) return null;
  const measuredFlowM3S = flows.reduce<number>((a, f) => a + f!, 0);
  if (measuredFlowM3S <= 0) return null;
  // Fan pressure and power were not read, so project a unit point: the results are the factors on today's values.
  const projected = fanSpeedForFlow({ speedRpm: system.fanSpeedRpm, flowM3S: measuredFlowM3S, pressurePa: 1, powerW: 1 }, system.designFlowM3S);
  return {
    measuredFlowM3S,
    designFlowM3S: system.designFlowM3S,
    speedRpm: system.fanSpeedRpm,
    targetSpeedRpm: projected.speedRpm,
    pressureFactor: projected.pressurePa,
    powerFactor: projected.powerW,
  };
}
