import "server-only";
import { recordAudit } from "@/db/queries/audit";
import {
  deleteDesignRows,
  findSectionByTag,
  findSystemByTag,
  getSectionInProject,
  getSystemInProject,
  getTerminalInProject,
  insertProjectWithEngineer,
  insertSection,
  insertSystem,
  insertTerminal,
  isEngineerOnAnyProject,
  listSectionsOfSystem,
  listTerminalIdsOfSections,
  listTerminalsOfSystem,
  subtreeOf,
  updateProjectRow,
  updateSectionRow,
  updateSystemRow,
  updateTerminalRow,
  type FieldDataHeld,
} from "@/db/queries/design";
import type { SessionUser } from "@/db/queries/users";
import type { AirSystem, DuctSection, Project, Terminal } from "@/db/schema";
import { terminalResource } from "@/lib/design/resources";
import { FORM_UNITS } from "@/lib/design/quantities";
import {
  DESIGN,
  isTerminalUnit,
  type ProjectInput,
  type ProjectPatch,
  type SectionInput,
  type SectionPatch,
  type SystemInput,
  type SystemPatch,
  type TerminalInput,
  type TerminalPatch,
} from "@/lib/validation/design";
import { zodFieldErrors, type ErrorBody } from "@/lib/validation/result";

/** What a design operation answers: a status and a JSON body (the route turns it into a response). */
export interface Outcome {
  status: number;
  body: unknown;
}

const ok = (status: number, body: unknown): Outcome => ({ status, body });
function fail(status: number, message: string, fields?: Record<string, string>, extra?: Record<string, unknown>): Outcome {
  const error: ErrorBody["error"] = fields ? { message, fields } : { message };
  return { status, body: { error, ...extra } };
}

/** Keys whose values differ, as {before, after} for the audit log. */
export function changes(before: Record<string, unknown>, after: Record<string, unknown>) {
  const b: Record<string, unknown> = {};
  const a: Record<string, unknown> = {};
  for (const key of Object.keys(after)) {
    if (key === "createdAt") continue;
    const x = before[key] instanceof Date ? (before[key] as Date).toISOString() : before[key];
    const y = after[key] instanceof Date ? (after[key] as Date).toISOString() : after[key];
    if (JSON.stringify(x) !== JSON.stringify(y)) {
      b[key] = x ?? null;
      a[key] = y ?? null;
    }
  }
  return { before: b, after: a };
}

function plain(row: object): Record<string, unknown> {
  return JSON.parse(JSON.stringify(row)) as Record<string, unknown>;
}

async function audit(user: SessionUser, projectId: string, action: string, entityType: string, entityId: string, detail: Record<string, unknown>) {
  await recordAudit({ userId: user.id, projectId, action, entityType, entityId, detail });
}

function invalid(error: Parameters<typeof zodFieldErrors>[0], what: string): Outcome {
  const fields = zodFieldErrors(error);
  return fail(400, `The ${what} is not valid: check ${Object.keys(fields).slice(0, 3).join(", ")}.`, fields);
}

// ---------------------------------------------------------------- projects

/** Site administrators, and engineers of at least one project, may start projects. */
export async function mayCreateProject(user: SessionUser): Promise<boolean> {
  return user.isAdmin || (await isEngineerOnAnyProject({ userId: user.id }));
}

/** Standard air when none is given: 0.075 lb/ft³ in inch-pound projects (US practice), 1.204 kg/m³ in SI (ASHRAE SI). */
export function defaultStandardDensity(unitSystem: "IP" | "SI"): number {
  return unitSystem === "IP" ? FORM_UNITS.IP.density.toSi(0.075) : 1.204;
}

export async function createProject(user: SessionUser, input: ProjectInput): Promise<Outcome> {
  const project = await insertProjectWithEngineer({
    userId: user.id,
    values: { ...input, standardDensityKgM3: input.standardDensityKgM3 ?? defaultStandardDensity(input.unitSystem) },
  });
  await audit(user, project.id, "project.created", "project", project.id, { after: plain(project) });
  return ok(201, { project });
}

export async function updateProject(user: SessionUser, project: Project, patch: ProjectPatch): Promise<Outcome> {
  const after = await updateProjectRow({ projectId: project.id, values: patch });
  const diff = changes(plain(project), plain(after));
  if (Object.keys(diff.after).length > 0) await audit(user, project.id, "project.updated", "project", project.id, diff);
  return ok(200, { project: after });
}

// ---------------------------------------------------------------- air systems

function systemApiShape(s: AirSystem) {
  return {
    tag: s.tag,
    name: s.name,
    kind: s.kind,
    location: s.location,
    designFlowM3S: s.designFlowM3S,
    designStaticPa: s.designStaticPa,
    fanSpeedRpm: s.fanSpeedRpm,
    designOutsideAirM3S: s.designOutsideAirM3S,
    motorPowerKw: s.motorPowerKw,
    motorSpeedRpm: s.motorSpeedRpm,
    motorFullLoadAmps: s.motorFullLoadAmps,
    motorVolts: s.motorVolts,
    motorPhases: s.motorPhases as 1 | 3 | null,
    motorServiceFactor: s.motorServiceFactor,
    hasVfd: s.hasVfd,
  };
}

export async function createSystem(user: SessionUser, project: Project, input: SystemInput): Promise<Outcome> {
  const taken = await findSystemByTag({ projectId: project.id, tag: input.tag });
  if (taken) return fail(409, `${taken.tag} is already an air system of this project.`, { tag: `${taken.tag} is already used in this project; choose another tag.` });
  const system = await insertSystem({ ...input, projectId: project.id });
  await audit(user, project.id, "system.created", "air_system", system.id, { after: plain(system) });
  return ok(201, { system });
}

export async function updateSystem(user: SessionUser, project: Project, systemId: string, patch: SystemPatch): Promise<Outcome> {
  const system = await getSystemInProject({ projectId: project.id, systemId });
  if (!system) return fail(404, "No such air system in this project.");
  const merged = DESIGN.system.safeParse({ ...systemApiShape(system), ...patch });
  if (!merged.success) return invalid(merged.error, "air system");
  if (patch.tag !== undefined && patch.tag.toLowerCase() !== system.tag.toLowerCase()) {
    const taken = await findSystemByTag({ projectId: project.id, tag: patch.tag });
    if (taken) return fail(409, `${taken.tag} is already an air system of this project.`, { tag: `${taken.tag} is already used in this project; choose another tag.` });
  }
  const after = await updateSystemRow({ systemId, values: patch });
  const diff = changes(plain(system), plain(after));
  if (Object.keys(diff.after).length > 0) await audit(user, project.id, "system.updated", "air_system", systemId, diff);
  return ok(200, { system: after });
}

/** Says in words what field data holds a design item, for the 409 answer. */
export function heldMessage(what: string, held: FieldDataHeld): string {
  const parts: string[] = [];
  if (held.traverses > 0) parts.push(`${held.traverses} traverse${held.traverses === 1 ? "" : "s"} (on ${held.traversedSections.join(", ")})`);
  if (held.terminalReadings > 0) parts.push(`${held.terminalReadings} terminal reading${held.terminalReadings === 1 ? "" : "s"} (of ${held.readTerminals.join(", ")})`);
  if (held.terminalSets > 0) parts.push(`${held.terminalSets} set${held.terminalSets === 1 ? "" : "s"} of terminal readings`);
  if (held.operatingConditions > 0) parts.push(`${held.operatingConditions} record${held.operatingConditions === 1 ? "" : "s"} of operating conditions`);
  return `${what} cannot be deleted: it holds field data (${parts.join("; ")}). Field data is never deleted with the design; change the design instead, or leave it in place.`;
}

export async function deleteSystem(user: SessionUser, project: Project, systemId: string): Promise<Outcome> {
  const system = await getSystemInProject({ projectId: project.id, systemId });
  if (!system) return fail(404, "No such air system in this project.");
  const sections = await listSectionsOfSystem({ systemId });
  const terminals = await listTerminalsOfSystem({ systemId });
  const result = await deleteDesignRows({ systemId }, { sectionIds: sections.map((s) => s.id), terminalIds: terminals.map((t) => t.id), systemId });
  if (!result.deleted) return fail(409, heldMessage(`Air system ${system.tag}`, result.held), undefined, { held: result.held });
  const deleted = { systems: [system.tag], sections: sections.map((s) => s.tag), terminals: terminals.map((t) => t.tag) };
  await audit(user, project.id, "system.deleted", "air_system", systemId, { before: { ...plain(system), sections: deleted.sections, terminals: deleted.terminals } });
  return ok(200, { deleted });
}

// ---------------------------------------------------------------- duct sections

function sectionApiShape(s: DuctSection) {
  return {
    systemId: s.systemId,
    parentId: s.parentId,
    tag: s.tag,
    shape: s.shape,
    diameterMm: s.diameterMm,
    widthMm: s.widthMm,
    heightMm: s.heightMm,
    designFlowM3S: s.designFlowM3S,
    straightUpstreamMm: s.straightUpstreamMm,
    straightDownstreamMm: s.straightDownstreamMm,
    location: s.location,
  };
}

/** The other shape's dimensions are cleared when the shape changes and the patch does not give them. */
function clearOtherShape<T extends { shape?: "round" | "rectangular" | null; diameterMm?: number | null; widthMm?: number | null; heightMm?: number | null }>(patch: T, previous: string | null): T {
  if (!patch.shape || patch.shape === previous) return patch;
  const out = { ...patch };
  if (patch.shape === "round") {
    if (!("widthMm" in patch)) out.widthMm = null;
    if (!("heightMm" in patch)) out.heightMm = null;
  } else if (!("diameterMm" in patch)) out.diameterMm = null;
  return out;
}

/** The path from a section up to the fan, as tags: S1.2.1 → S1.2 → S1. */
function upstreamPath(sections: DuctSection[], fromId: string): DuctSection[] {
  const byId = new Map(sections.map((s) => [s.id, s]));
  const path: DuctSection[] = [];
  let at = byId.get(fromId);
  while (at && path.length <= sections.length) {
    path.push(at);
    at = at.parentId ? byId.get(at.parentId) : undefined;
  }
  return path;
}

async function checkParent(projectId: string, system: AirSystem, parentId: string | null | undefined, movingId?: string, movingTag?: string): Promise<Outcome | null> {
  if (!parentId) return null;
  const parent = await getSectionInProject({ projectId, sectionId: parentId });
  if (!parent) return fail(404, "No such upstream section in this project.", { parentId: "No such section in this project." });
  if (parent.system.id !== system.id)
    return fail(400, "The upstream section must be in the same air system.", { parentId: `${parent.section.tag} belongs to ${parent.system.tag}, not ${system.tag}.` });
  if (movingId) {
    if (parentId === movingId) return fail(400, "A section cannot feed itself.", { parentId: `${movingTag} cannot be its own upstream section.` });
    const path = upstreamPath(await listSectionsOfSystem({ systemId: system.id }), parentId);
    if (path.some((s) => s.id === movingId)) {
      const loop = path.slice(0, path.findIndex((s) => s.id === movingId) + 1).map((s) => s.tag);
      return fail(400, `Moving ${movingTag} under ${parent.section.tag} would make a loop.`, {
        parentId: `${parent.section.tag} is downstream of ${movingTag} (${loop.reverse().join(" → ")}); a section cannot sit below its own branches.`,
      });
    }
  }
  return null;
}

export async function createSection(user: SessionUser, project: Project, input: SectionInput): Promise<Outcome> {
  const system = await getSystemInProject({ projectId: project.id, systemId: input.systemId });
  if (!system) return fail(404, "No such air system in this project.", { systemId: "No such air system in this project." });
  const parentProblem = await checkParent(project.id, system, input.parentId);
  if (parentProblem) return parentProblem;
  const taken = await findSectionByTag({ systemId: system.id, tag: input.tag });
  if (taken) return fail(409, `${system.tag} already has a section ${taken.tag}.`, { tag: `${taken.tag} is already used in ${system.tag}; choose another tag.` });
  const section = await insertSection({ ...input, parentId: input.parentId ?? null, kind: input.parentId ? "branch" : "trunk" });
  await audit(user, project.id, "section.created", "duct_section", section.id, { after: plain(section) });
  return ok(201, { section });
}

export async function updateSection(user: SessionUser, project: Project, sectionId: string, rawPatch: SectionPatch): Promise<Outcome> {
  const found = await getSectionInProject({ projectId: project.id, sectionId });
  if (!found) return fail(404, "No such duct section in this project.");
  const { section, system } = found;
  const patch = clearOtherShape(rawPatch, section.shape);
  const merged = DESIGN.section.safeParse({ ...sectionApiShape(section), ...patch });
  if (!merged.success) return invalid(merged.error, "duct section");
  if (patch.parentId !== undefined && patch.parentId !== section.parentId) {
    const problem = await checkParent(project.id, system, patch.parentId, section.id, section.tag);
    if (problem) return problem;
  }
  if (patch.tag !== undefined && patch.tag.toLowerCase() !== section.tag.toLowerCase()) {
    const taken = await findSectionByTag({ systemId: system.id, tag: patch.tag });
    if (taken) return fail(409, `${system.tag} already has a section ${taken.tag}.`, { tag: `${taken.tag} is already used in ${system.tag}; choose another tag.` });
  }
  const parentId = patch.parentId === undefined ? section.parentId : patch.parentId;
  const after = await updateSectionRow({ sectionId, values: { ...patch, parentId, kind: parentId ? "branch" : "trunk" } });
  const diff = changes(plain(section), plain(after));
  if (Object.keys(diff.after).length > 0) await audit(user, project.id, "section.updated", "duct_section", sectionId, diff);
  return ok(200, { section: after });
}

export async function deleteSection(user: SessionUser, project: Project, sectionId: string): Promise<Outcome> {
  const found = await getSectionInProject({ projectId: project.id, sectionId });
  if (!found) return fail(404, "No such duct section in this project.");
  const all = await listSectionsOfSystem({ systemId: found.system.id });
  const ids = subtreeOf(all, sectionId);
  const terminals = await listTerminalIdsOfSections({ sectionIds: ids });
  const result = await deleteDesignRows({ sectionIds: ids }, { sectionIds: ids, terminalIds: terminals.map((t) => t.id) });
  const below = ids.length > 1 ? ` or the ${ids.length - 1} section${ids.length === 2 ? "" : "s"} below it` : "";
  if (!result.deleted) return fail(409, heldMessage(`Section ${found.section.tag}${below}`, result.held), undefined, { held: result.held });
  const tags = all.filter((s) => ids.includes(s.id)).map((s) => s.tag);
  const deleted = { systems: [], sections: tags, terminals: terminals.map((t) => t.tag) };
  await audit(user, project.id, "section.deleted", "duct_section", sectionId, { before: { ...plain(found.section), sectionsBelow: tags.filter((t) => t !== found.section.tag), terminals: deleted.terminals } });
  return ok(200, { deleted });
}

// ---------------------------------------------------------------- terminals

function terminalApiShape(t: Terminal) {
  const r = terminalResource(t);
  return {
    sectionId: r.sectionId,
    tag: r.tag,
    kind: r.kind,
    service: r.service,
    room: r.room,
    device: r.device,
    sizeShape: r.sizeShape,
    diameterMm: r.diameterMm,
    widthMm: r.widthMm,
    heightMm: r.heightMm,
    designFlowM3S: r.designFlowM3S,
    designMinFlowM3S: r.designMinFlowM3S,
    designHeatingFlowM3S: r.designHeatingFlowM3S,
    effectiveAreaM2: r.effectiveAreaM2,
    controllerFlowFactor: r.controllerFlowFactor,
  };
}

/** The columns a terminal row takes from the API's JSON (`kind` is stored as `type`). */
function terminalColumns(input: Partial<TerminalInput>) {
  const { kind, ...rest } = input;
  return kind === undefined ? rest : { ...rest, type: kind };
}

async function tagTakenInSystem(systemId: string, tag: string, exceptId?: string): Promise<Terminal | undefined> {
  const all = await listTerminalsOfSystem({ systemId });
  return all.find((t) => t.id !== exceptId && t.tag.toLowerCase() === tag.toLowerCase());
}

export async function createTerminal(user: SessionUser, project: Project, input: TerminalInput): Promise<Outcome> {
  const found = await getSectionInProject({ projectId: project.id, sectionId: input.sectionId });
  if (!found) return fail(404, "No such duct section in this project.", { sectionId: "No such duct section in this project." });
  const taken = await tagTakenInSystem(found.system.id, input.tag);
  if (taken) return fail(409, `${found.system.tag} already has a terminal ${taken.tag}.`, { tag: `${taken.tag} is already used in ${found.system.tag}; choose another tag.` });
  const terminal = await insertTerminal({
    ...terminalColumns(input),
    sectionId: input.sectionId,
    tag: input.tag,
    designFlowM3S: input.designFlowM3S,
    service: input.service ?? found.system.kind,
  });
  await audit(user, project.id, "terminal.created", "terminal", terminal.id, { after: terminalResource(terminal) });
  return ok(201, { terminal: terminalResource(terminal) });
}

export async function updateTerminal(user: SessionUser, project: Project, terminalId: string, rawPatch: TerminalPatch): Promise<Outcome> {
  const found = await getTerminalInProject({ projectId: project.id, terminalId });
  if (!found) return fail(404, "No such terminal in this project.");
  let patch = clearOtherShape({ ...rawPatch, shape: rawPatch.sizeShape }, found.terminal.sizeShape);
  delete patch.shape;
  if (rawPatch.sizeShape === null) patch = { ...patch, diameterMm: patch.diameterMm ?? null, widthMm: patch.widthMm ?? null, heightMm: patch.heightMm ?? null };
  // A change of kind drops the fields that do not apply to the new kind, unless the patch sets them.
  if (rawPatch.kind !== undefined && rawPatch.kind !== found.terminal.type) {
    const unit = isTerminalUnit(rawPatch.kind);
    for (const key of unit ? (["effectiveAreaM2"] as const) : (["designMinFlowM3S", "designHeatingFlowM3S", "controllerFlowFactor"] as const))
      if (!(key in rawPatch)) patch = { ...patch, [key]: null };
    if (rawPatch.kind === "constant_volume_box")
      for (const key of ["designMinFlowM3S", "designHeatingFlowM3S"] as const) if (!(key in rawPatch)) patch = { ...patch, [key]: null };
  }
  const merged = DESIGN.terminal.safeParse({ ...terminalApiShape(found.terminal), ...patch });
  if (!merged.success) return invalid(merged.error, "terminal");
  let system = found.system;
  if (patch.sectionId !== undefined && patch.sectionId !== found.terminal.sectionId) {
    const target = await getSectionInProject({ projectId: project.id, sectionId: patch.sectionId });
    if (!target) return fail(404, "No such duct section in this project.", { sectionId: "No such duct section in this project." });
    system = target.system;
  }
  const tagNow = patch.tag ?? found.terminal.tag;
  if (patch.tag !== undefined || system.id !== found.system.id) {
    const taken = await tagTakenInSystem(system.id, tagNow, terminalId);
    if (taken) return fail(409, `${system.tag} already has a terminal ${taken.tag}.`, { tag: `${taken.tag} is already used in ${system.tag}; choose another tag.` });
  }
  const after = await updateTerminalRow({ terminalId, values: terminalColumns(patch) });
  const diff = changes(terminalResource(found.terminal) as unknown as Record<string, unknown>, terminalResource(after) as unknown as Record<string, unknown>);
  if (Object.keys(diff.after).length > 0) await audit(user, project.id, "terminal.updated", "terminal", terminalId, diff);
  return ok(200, { terminal: terminalResource(after) });
}

export async function deleteTerminal(user: SessionUser, project: Project, terminalId: string): Promise<Outcome> {
  const found = await getTerminalInProject({ projectId: project.id, terminalId });
  if (!found) return fail(404, "No such terminal in this project.");
  const result = await deleteDesignRows({ terminalId }, { sectionIds: [], terminalIds: [terminalId] });
  if (!result.deleted) return fail(409, heldMessage(`Terminal ${found.terminal.tag}`, result.held), undefined, { held: result.held });
  await audit(user, project.id, "terminal.deleted", "terminal", terminalId, { before: terminalResource(found.terminal) });
  return ok(200, { deleted: { systems: [], sections: [], terminals: [found.terminal.tag] } });
}

/** The outcome as the route's response. */
export function respond(outcome: Outcome): Response {
  return Response.json(outcome.body, { status: outcome.status });
}
