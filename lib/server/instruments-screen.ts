import "server-only";
import { getInstrument, getInstrumentUsage, listInstruments, listRolesOfUser } from "@/db/queries/instruments";
import { isUuid } from "@/db/queries/projects";
import type { Instrument } from "@/lib/api-client/field";
import { requireUser } from "@/lib/auth/guards";
import { canKeepInstrumentRegister } from "@/lib/auth/policy";
import { instrumentJson } from "./field-json";

/** What the register screens start from: the user, whether they may change the register, and their unit system. */
export async function loadRegisterScreen() {
  const user = await requireUser();
  const roles = await listRolesOfUser({ userId: user.id });
  return { user, canEdit: canKeepInstrumentRegister(user, roles), units: user.unitSystem ?? "SI" };
}

/** Instruments as the API sends them (dates as strings), for client components' first render. */
export async function registerForClient(): Promise<Instrument[]> {
  const today = new Date();
  return JSON.parse(JSON.stringify((await listInstruments({ includeRetired: true })).map((r) => instrumentJson(r, undefined, today))));
}

export async function instrumentForClient(id: string) {
  if (!isUuid(id)) return null;
  const row = await getInstrument({ id });
  if (!row) return null;
  const usage = await getInstrumentUsage({ id });
  return JSON.parse(JSON.stringify(instrumentJson(row, usage))) as Instrument & { usage: { traverses: number; terminalReadings: number; lastUsedAt: string | null } };
}
