import * as s from "../schema";
import type { Tx } from "./index";

export async function seedClinic(tx: Tx, projectId: string) {
  const [rtu] = await tx
    .insert(s.airSystems)
    .values({ projectId, tag: "RTU-2", name: "Consulting suites supply", kind: "supply", designFlowM3S: 1.2, location: "Roof" })
    .returning();
  await tx.insert(s.ductSections).values({
    systemId: rtu!.id,
    tag: "C1",
    kind: "trunk",
    shape: "rectangular",
    widthMm: 700,
    heightMm: 400,
    designFlowM3S: 1.2,
    location: "Corridor ceiling, level 1",
  });
}
