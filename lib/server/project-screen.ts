import "server-only";
import { requireProjectPage } from "@/lib/auth/guards";
import type { Action } from "@/lib/auth/policy";
import { unitSystemFor } from "@/lib/units";
import { loadAirflowView } from "./airflow-view";

/**
 * What every airflow screen of a project starts from: the signed-in member (404 for others), whether
 * their role may use this screen, their unit system, and the project's systems reduced by the engine.
 */
export async function loadAirflowScreen(params: Promise<{ projectId: string }>, action: Action) {
  const { projectId } = await params;
  const { user, access, allowed } = await requireProjectPage(projectId, action);
  if (!allowed) return { allowed: false as const };
  const { project } = access;
  return { allowed: true as const, user, access, project, units: unitSystemFor(user, project), systems: await loadAirflowView(project) };
}
