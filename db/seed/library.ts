import * as s from "../schema";
import type { Tx } from "./index";

/**
 * Velocity pressures (Pa) of the demo traverses, line by line, point by point. Invented readings
 * shaped like developed profiles with a little skew and scatter, so the branches account for a few
 * per cent less air than the trunk carries, as leaky ductwork does.
 */
const DEMO_TRAVERSES = {
  // 1200 × 600 rectangular, 7 lines × 5 points, log-Tchebycheff
  S1: [
    [7.7, 12.3, 14.1, 11.6, 8.5],
    [11.4, 17.8, 21.7, 17.5, 12.3],
    [14.1, 23.0, 25.4, 20.4, 15.3],
    [16.7, 23.7, 28.3, 25.7, 15.8],
    [15.6, 22.2, 27.5, 21.3, 15.3],
    [13.6, 18.8, 23.9, 19.2, 14.1],
    [9.3, 13.1, 16.3, 13.4, 9.6],
  ],
  // Ø 630 round, 2 diameters × 8 points, log-linear
  "S1.1": [
    [7.0, 11.0, 13.7, 16.0, 18.4, 14.1, 13.3, 8.6],
    [7.8, 13.1, 13.9, 18.1, 16.5, 12.8, 12.3, 7.3],
  ],
  // 800 × 400 rectangular, 6 lines × 5 points, log-Tchebycheff
  "S1.2": [
    [5.4, 7.5, 9.5, 7.7, 5.6],
    [7.4, 11.5, 14.0, 11.3, 8.0],
    [9.0, 14.6, 16.1, 12.9, 9.7],
    [9.5, 13.5, 16.1, 14.6, 9.0],
    [8.0, 11.3, 14.0, 10.8, 7.8],
    [5.4, 7.5, 9.5, 7.7, 5.6],
  ],
  // Ø 500 round, 2 diameters × 8 points, log-linear
  "S1.3": [
    [9.8, 14.7, 17.9, 19.4, 19.5, 13.9, 12.7, 7.9],
    [7.9, 13.6, 14.7, 19.9, 19.4, 15.6, 15.2, 9.3],
  ],
} as const;

export async function seedLibrary(tx: Tx, projectId: string, technicianId: string, reviewerId: string) {
  const [ahu, ef] = await tx
    .insert(s.airSystems)
    .values([
      {
        projectId,
        tag: "AHU-1",
        name: "Reading rooms supply",
        kind: "supply",
        designFlowM3S: 4.0,
        designStaticPa: 750,
        fanSpeedRpm: 1150,
        location: "Roof plant room",
      },
      {
        projectId,
        tag: "EF-1",
        name: "Washroom and workshop exhaust",
        kind: "exhaust",
        designFlowM3S: 0.9,
        designStaticPa: 250,
        fanSpeedRpm: 1420,
        location: "Roof, north parapet",
      },
    ])
    .returning();

  const [trunk] = await tx
    .insert(s.ductSections)
    .values({
      systemId: ahu!.id,
      tag: "S1",
      kind: "trunk",
      shape: "rectangular",
      widthMm: 1200,
      heightMm: 600,
      designFlowM3S: 4.0,
      straightUpstreamMm: 9000,
      straightDownstreamMm: 2400,
      location: "Plant room riser, 1.8 m above floor",
    })
    .returning();
  const branches = await tx
    .insert(s.ductSections)
    .values([
      { systemId: ahu!.id, parentId: trunk!.id, tag: "S1.1", kind: "branch", shape: "round", diameterMm: 630, designFlowM3S: 1.5, straightUpstreamMm: 5200, straightDownstreamMm: 1300, location: "East reading room ceiling" },
      { systemId: ahu!.id, parentId: trunk!.id, tag: "S1.2", kind: "branch", shape: "rectangular", widthMm: 800, heightMm: 400, designFlowM3S: 1.4, straightUpstreamMm: 4100, straightDownstreamMm: 1200, location: "West reading room ceiling" },
      { systemId: ahu!.id, parentId: trunk!.id, tag: "S1.3", kind: "branch", shape: "round", diameterMm: 500, designFlowM3S: 1.1, straightUpstreamMm: 3600, straightDownstreamMm: 900, location: "Children's library ceiling" },
    ])
    .returning();

  const [exhaustTrunk] = await tx
    .insert(s.ductSections)
    .values({ systemId: ef!.id, tag: "X1", kind: "trunk", shape: "round", diameterMm: 450, designFlowM3S: 0.9, straightUpstreamMm: 4000, straightDownstreamMm: 1000, location: "Roof curb" })
    .returning();
  const exhaustBranches = await tx
    .insert(s.ductSections)
    .values([
      { systemId: ef!.id, parentId: exhaustTrunk!.id, tag: "X1.1", kind: "branch", shape: "round", diameterMm: 315, designFlowM3S: 0.5, location: "Ground floor washrooms" },
      { systemId: ef!.id, parentId: exhaustTrunk!.id, tag: "X1.2", kind: "branch", shape: "round", diameterMm: 315, designFlowM3S: 0.4, location: "Workshop and store" },
    ])
    .returning();

  const terminal = (sectionId: string, tag: string, service: "supply" | "exhaust", room: string, designFlowM3S: number, device: string) => ({
    sectionId,
    tag,
    service,
    type: service === "supply" ? ("diffuser" as const) : ("grille" as const),
    room,
    designFlowM3S,
    device,
  });
  const [east, west, children] = branches;
  const [washrooms, workshop] = exhaustBranches;
  await tx.insert(s.terminals).values([
    ...[1, 2, 3, 4].map((n) => terminal(east!.id, `SD-10${n}`, "supply", "East reading room", 0.375, "600×600 four-way ceiling diffuser")),
    ...[1, 2, 3, 4, 5].map((n) => terminal(west!.id, `SD-11${n}`, "supply", "West reading room", 0.28, "Linear slot diffuser, 1.2 m")),
    ...[1, 2, 3, 4].map((n) => terminal(children!.id, `SD-12${n}`, "supply", "Children's library", 0.275, "Round swirl diffuser, 400 mm")),
    ...[1, 2, 3, 4].map((n) => terminal(washrooms!.id, `EG-20${n}`, "exhaust", "Ground floor washrooms", 0.125, "Egg-crate exhaust grille 300×300")),
    ...[1, 2].map((n) => terminal(workshop!.id, `EG-21${n}`, "exhaust", "Workshop and store", 0.2, "Exhaust grille 400×300")),
  ]);

  const plan = [
    { section: trunk!, tag: "S1", minutes: 0, dryBulbC: 14.5, staticPa: 310, status: "submitted", notes: "Ports on the top face, 9 m downstream of the coil, 2.4 m upstream of the first take-off." },
    { section: east!, tag: "S1.1", minutes: 55, dryBulbC: 15.2, staticPa: 180, status: "approved", notes: "Ports at 10 and 2 o'clock, above the ceiling grid." },
    { section: west!, tag: "S1.2", minutes: 95, dryBulbC: 15.4, staticPa: 165, status: "approved", notes: "Ports on the top face from the access panel." },
    { section: children!, tag: "S1.3", minutes: 130, dryBulbC: 15.6, staticPa: 140, status: "submitted", notes: "Damper fully open at the time of reading." },
  ] as const;
  const start = Date.parse("2026-11-24T09:40:00Z");
  for (const item of plan) {
    const grid = DEMO_TRAVERSES[item.tag];
    const takenAt = new Date(start + item.minutes * 60_000);
    const [traverse] = await tx
      .insert(s.traverses)
      .values({
        sectionId: item.section.id,
        method: "log-linear",
        lines: grid.length,
        pointsPerLine: grid[0]!.length,
        instrument: "Pitot-static tube, 900 mm, with digital micromanometer",
        instrumentSerial: "MM-30418",
        probeCoefficient: 1.0,
        dryBulbC: item.dryBulbC,
        relativeHumidityPct: 47,
        barometricPa: 98_790,
        staticPa: item.staticPa,
        portOffsetMm: 25,
        status: item.status,
        notes: item.notes,
        takenBy: technicianId,
        takenAt,
        submittedAt: new Date(takenAt.getTime() + 20 * 60_000),
      })
      .returning();
    await tx.insert(s.readings).values(
      grid.flatMap((line, i) => line.map((value, j) => ({ traverseId: traverse!.id, line: i + 1, point: j + 1, value, recordedAt: takenAt }))),
    );
    if (item.status === "approved") {
      await tx.insert(s.reviews).values({
        traverseId: traverse!.id,
        reviewerId,
        decision: "approved",
        reason: "Witnessed two points on each line; readings repeat within 2 %.",
        witnessed: true,
        traverseVersion: 1,
      });
    }
  }
}
