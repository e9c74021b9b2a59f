/**
 * The closeout report renderer: a report model in, PDF bytes out, with no database or network.
 * Order as the trade reads such a report: cover, the TAB supervisor's certification, contents,
 * summary per system, one part per traverse, outlets and terminal units, continuity at junctions,
 * instruments, photos, cautions and limits, the verification sample, approvals. Every page carries
 * the running header, "n of N", the verification link and its QR code; a draft is marked on every
 * page and carries no verification code.
 */
import { degrees, PDFDocument, rgb } from "pdf-lib";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import { SAFETY_CAUTIONS, SAFETY_FOOTNOTE } from "@/lib/safety/cautions";
import { drawCrossSection, drawProfileChart, drawQr } from "./graphics";
import type { ItemStatus, ReportModel, ReportTraverse, SummaryRow } from "./model";
import { embedFonts } from "./fonts";
import { ACCENT, deflatePageContents, Flow, geometryFor, INK, RULE, SOFT, WARN, wrap, type Cell } from "./pdf-kit";

export const DRAFT_MARK = "Draft — not issued";
export const AIR_SIDE_NOTE = "This report covers the air side only. Hydronic balancing, where the project has it, is reported separately.";
export const REVIEW_STATEMENT =
  "The results in this report are for the engineer of record's review. They defer to local codes and licensed practice; nothing here replaces the judgement of the licensed professionals responsible for the building.";
const SIGNATURE_LIMITS =
  "The server's digital signature proves that this file is byte for byte the one this Airtally deployment issued, and who approved it in the app. It is not a professional engineer's seal; seal rules are local. The TAB supervisor's certification is a person's statement, separate from the file's signature.";

const STATUS_WORDS: Record<ItemStatus, string> = {
  approved: "Approved",
  submitted: "Submitted, awaiting review",
  draft: "Draft, not submitted",
  returned: "Returned for rework",
  "not read": "Not read",
};

function dateText(iso: string | null): string {
  if (!iso) return "—";
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toISOString().slice(0, 10);
}

function timeText(iso: string | null): string {
  if (!iso) return "—";
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

const pct = (v: number | null, digits = 0) => (v === null ? "—" : `${v.toFixed(digits)} %`);
const verdictWord = (pass: boolean | null) => (pass === null ? "—" : pass ? "Within band" : "Outside band");

interface ContentsEntry {
  title: string;
  level: 1 | 2;
  page: number;
}

export interface RenderOptions {
  /** Fixed document dates make the bytes reproducible for one model (tests, issue retries). */
  documentDate?: Date;
}

/** The closeout report as PDF bytes. */
export async function renderReport(model: ReportModel, options: RenderOptions = {}): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const fonts = await embedFonts(doc);
  const geo = geometryFor(model.units);
  const flow = new Flow(doc, fonts, geo);
  const u = model.units;
  const q = (quantity: Parameters<typeof formatQuantity>[1], value: number | null, opts?: { decimals?: number }) =>
    value === null || !Number.isFinite(value) ? "—" : formatQuantity(u, quantity, value, opts);
  const title = model.kind === "draft" ? "Air-side test and balance report (draft)" : "Air-side test and balance closeout report";
  const contents: ContentsEntry[] = [];
  const section = (name: string) => {
    flow.newPage();
    contents.push({ title: name, level: 1, page: flow.pageNumber });
    flow.heading(name, 1);
  };

  // ---- Cover -------------------------------------------------------------------------------------
  flow.newPage();
  flow.space(40);
  flow.text(model.kind === "draft" ? DRAFT_MARK.toUpperCase() : "ISSUED REPORT", { size: 10, weight: "bold", color: model.kind === "draft" ? WARN : ACCENT });
  flow.space(6);
  flow.text(title, { size: 24, weight: "bold" });
  flow.space(4);
  flow.text(model.project.name, { size: 15, weight: "medium", color: SOFT });
  flow.space(26);
  const systemsText = model.systems.map((s) => `${s.tag} ${s.name}`).join("; ") || "None set up";
  flow.facts(
    [
      ["Site", model.project.siteName],
      ["Address", model.project.address || "—"],
      ["Systems", systemsText],
      ["Readings taken", model.period.from ? `${dateText(model.period.from)} to ${dateText(model.period.to)}` : "No readings yet"],
      ["Measured by", model.measuredBy.join(", ") || "—"],
      [
        "Approved by",
        model.approvals.length > 0 ? model.approvals.map((a) => `${a.name} (${a.role}, ${dateText(a.at)})`).join("; ") : model.kind === "draft" ? "Not approved yet (draft)" : "—",
      ],
      ["Revision", model.revision === null ? "Draft: not issued, no revision" : String(model.revision)],
      ["Verification code", model.code ?? "None: drafts cannot be verified"],
      [model.kind === "draft" ? "Generated" : "Issued", timeText(model.generatedAt)],
      ["Units", u === "IP" ? "Inch-pound (airflow in cfm at standard air)" : "SI (airflow in L/s at standard air)"],
      ["Standard air", `${q("density", model.project.standardDensityKgM3)}; site altitude ${q("length", model.project.altitudeM, { decimals: 0 })}`],
    ],
    1,
    10,
  );
  if (model.reason) {
    flow.space(8);
    flow.facts([["Why this revision", model.reason]], 1, 10);
  }
  flow.space(18);
  flow.box(
    model.kind === "draft" ? "A draft for review" : "How to check this report",
    model.kind === "draft"
      ? [
          "This draft is built from the data as they stand now, approved or not; every item shows where it stands in review. It is not signed and cannot be verified. The issued report contains approved data only.",
          AIR_SIDE_NOTE,
        ]
      : [
          `Scan the code in the page footer or open ${model.verifyUrl}, and upload this file: the page says whether it is exactly the file that was issued, and who approved it. Verification code ${model.code}.`,
          AIR_SIDE_NOTE,
        ],
  );

  // ---- Certification -----------------------------------------------------------------------------
  section("Certification by the TAB supervisor");
  const c = model.certification;
  if (c.state === "none") {
    flow.box("No TAB supervisor designated", ["The project has no certified TAB supervisor designated yet. A report cannot be issued until one is designated and has signed the statement below in the app."], { color: WARN });
  } else {
    flow.box(c.state === "signed" ? "Statement signed in the app" : "Statement not signed yet", [c.statement ?? ""], { color: c.state === "signed" ? ACCENT : WARN });
    flow.facts(
      [
        ["TAB supervisor", c.name ?? "—"],
        ["Certifying body", c.certifyingBody ?? "—"],
        ["Certificate number", c.certificateNumber ?? "—"],
        ["Signed in the app", c.state === "signed" ? timeText(c.signedAt) : "Not signed yet: required before issue"],
      ],
      1,
      10,
    );
  }
  flow.space(14);
  flow.text(SIGNATURE_LIMITS, { size: 9, color: SOFT });

  // ---- Contents (filled in once every page number is known) ---------------------------------------
  flow.newPage();
  const contentsPageIndex = flow.pages.length - 1;

  // ---- Summary per system ------------------------------------------------------------------------
  section("Summary by system");
  flow.text(
    `Design against measured airflow at standard air (${q("density", model.project.standardDensityKgM3)}). Acceptance bands: fans ${model.tolerances.fan}, duct sections ${model.tolerances.section}, outlets ${model.tolerances.outlet}, terminal units ${model.tolerances.terminalUnit}; continuity at junctions within ±${model.tolerances.continuityPct} % by mass. Contract documents govern.`,
    { size: 9, color: SOFT },
  );
  flow.space(6);
  const flowUnit = formatQuantity(u, "flow", 1).replace(/^[\d.,]+ /, "");
  for (const system of model.systems) {
    contents.push({ title: `${system.tag} ${system.name}`, level: 2, page: flow.pageNumber });
    flow.heading(`${system.tag} ${system.name}`, 2);
    flow.text(`${system.kind} system${system.location ? `, ${system.location}` : ""}; design ${q("flow", system.designM3S)}.`, { size: 9, color: SOFT });
    flow.space(3);
    flow.table(
      [
        { header: "Section", width: 1.1 },
        { header: "Location", width: 2.2 },
        { header: "Review", width: 1.7 },
        { header: `Design, ${flowUnit}`, width: 1.1, align: "right" },
        { header: `Measured, ${flowUnit}`, width: 1.1, align: "right" },
        { header: "% of design", width: 0.9, align: "right" },
        { header: "Band", width: 0.9, align: "right" },
        { header: "Result", width: 1.1 },
      ],
      system.rows.map((r) => summaryCells(r, u)),
    );
    if (system.rows.length === 0) flow.text("No duct sections set up.", { size: 9 });
    const excluded = system.rows.filter((r) => r.excluded);
    if (model.kind === "issued" && excluded.length > 0)
      flow.text(`Not approved — excluded: ${excluded.map((r) => r.tag).join(", ")}. Their readings are not part of this report until they are approved.`, { size: 8.5, color: WARN });
    if (model.kind === "issued" && system.terminalSet.excluded) flow.text("Outlet and terminal-unit readings: not approved — excluded.", { size: 8.5, color: WARN });
  }
  contents.push({ title: "Accepted deviations", level: 2, page: flow.pageNumber });
  flow.heading("Accepted deviations", 2);
  if (model.deviations.length === 0) flow.text("No accepted deviations.", { size: 9.5 });
  else
    flow.table(
      [
        { header: "Item", width: 1.2 },
        { header: "% of design", width: 0.9, align: "right" },
        { header: "Reason accepted", width: 4 },
        { header: "Accepted by", width: 1.8 },
      ],
      model.deviations.map((d) => [d.item, pct(d.pctOfDesign), d.reason, `${d.acceptedBy}, ${dateText(d.acceptedAt)}`]),
    );

  // ---- Traverses ---------------------------------------------------------------------------------
  if (model.traverses.length === 0) {
    section("Traverses");
    flow.text(model.kind === "issued" ? "No approved traverse." : "No traverse recorded yet.", { size: 10 });
  }
  model.traverses.forEach((t, i) => {
    flow.newPage();
    if (i === 0) contents.push({ title: "Traverses", level: 1, page: flow.pageNumber });
    const name = `${t.systemTag} / ${t.sectionTag}${t.revision > 1 ? ` (revision ${t.revision})` : ""}`;
    contents.push({ title: `${name}${t.location ? `, ${t.location}` : ""}`, level: 2, page: flow.pageNumber });
    flow.heading(`Traverse ${name}`, 1);
    renderTraverse(flow, t, u, model.kind);
  });

  // ---- Outlets and terminal units ----------------------------------------------------------------
  section("Outlets and terminal units");
  flow.text("Latest initial (as found) and final (as left) reading of each outlet and terminal unit at each setpoint, at standard air, against its design airflow.", { size: 9, color: SOFT });
  for (const system of model.systems) {
    flow.heading(`${system.tag} ${system.name}`, 2);
    flow.text(`Readings ${STATUS_WORDS[system.terminalSet.status].toLowerCase()}${system.terminalSet.revision ? ` (set revision ${system.terminalSet.revision})` : ""}.`, { size: 9, color: SOFT });
    if (system.terminalSet.excluded) {
      flow.text("Not approved — excluded from this report.", { size: 9.5, color: WARN });
      continue;
    }
    if (system.terminals.length === 0) {
      flow.text("No outlets or terminal units scheduled.", { size: 9.5 });
      continue;
    }
    flow.table(
      [
        { header: "Tag", width: 0.9 },
        { header: "Room, device", width: 2.4 },
        { header: "Setpoint", width: 0.9 },
        { header: `Design, ${flowUnit}`, width: 0.9, align: "right" },
        { header: `Initial, ${flowUnit}`, width: 1.3, align: "right" },
        { header: `Final, ${flowUnit}`, width: 1.3, align: "right" },
        { header: "Band", width: 0.8, align: "right" },
        { header: "Result (final)", width: 1.1 },
      ],
      system.terminals.map((row) => {
        const cell = (r: typeof row.initial) => (r ? `${formatQuantity(u, "flow", r.standardFlowM3S, { withUnit: false })} (${pct(r.pctOfDesign)})` : "not read");
        const judged = row.final ?? row.initial;
        return [
          { text: row.tag, weight: "semibold" },
          `${row.room}${row.device ? `, ${row.device}` : ""}`,
          row.setpoint,
          row.designM3S === null ? "—" : formatQuantity(u, "flow", row.designM3S, { withUnit: false }),
          cell(row.initial),
          cell(row.final),
          row.band,
          judged ? { text: `${verdictWord(judged.pass)}${row.final ? "" : " (initial)"}`, color: judged.pass === false ? WARN : INK } : "—",
        ] satisfies Cell[];
      }),
    );
    if (system.conditions.length > 0) flow.text(`Operating conditions: ${system.conditions.join(" ")}`, { size: 8.5, color: SOFT });
  }

  // ---- Continuity --------------------------------------------------------------------------------
  section("Continuity at junctions");
  flow.text(
    `At every junction the trunk's mass flow is compared with the sum of its branches' (volumes add only where the density is the same). A junction passes within ±${model.tolerances.continuityPct} % of the trunk. The difference is unaccounted airflow: leakage is found only by a pressure test.`,
    { size: 9, color: SOFT },
  );
  const massUnit = formatQuantity(u, "massFlow", 1).replace(/^[\d.,]+ /, "");
  for (const system of model.systems) {
    flow.heading(`${system.tag} ${system.name}`, 2);
    if (system.junctions.length === 0) {
      flow.text("No junctions: the system has a single section.", { size: 9.5 });
      continue;
    }
    flow.table(
      [
        { header: "Trunk", width: 0.8 },
        { header: "Branches", width: 1.3 },
        { header: `Trunk, ${massUnit}`, width: 1, align: "right" },
        { header: `Branches, ${massUnit}`, width: 1, align: "right" },
        { header: "Difference", width: 1.6, align: "right" },
        { header: "Result", width: 0.9 },
        { header: "Note", width: 2.4 },
      ],
      system.junctions.map((j) =>
        j.status === "waiting"
          ? [j.parentTag, j.childTags.join(", "), "—", "—", "—", "Not checked", `Waiting for ${j.missing.join(", ")}${model.kind === "issued" ? " (not measured or not approved)" : ""}.`]
          : [
              j.parentTag,
              j.childTags.join(", "),
              q("massFlow", j.parentMassKgS).replace(` ${massUnit}`, ""),
              q("massFlow", j.childrenMassKgS).replace(` ${massUnit}`, ""),
              `${q("massFlow", j.imbalanceKgS)} (${pct(j.imbalancePct, 1)}); ${q("flow", j.imbalanceStandardM3S)} std.`,
              { text: j.pass ? "Pass" : "Fail", weight: "semibold", color: j.pass ? INK : WARN },
              j.note,
            ],
      ),
    );
  }

  // ---- Instruments -------------------------------------------------------------------------------
  section("Instruments");
  flow.text("Every instrument the reported readings were taken with, from the instrument register, with its calibration.", { size: 9, color: SOFT });
  flow.space(3);
  if (model.instruments.length === 0) flow.text("No instrument from the register is named on the reported readings.", { size: 9.5 });
  else
    flow.table(
      [
        { header: "Instrument", width: 2.6 },
        { header: "Serial", width: 1.1 },
        { header: "Calibrated", width: 1 },
        { header: "Due", width: 1 },
        { header: "Certificate", width: 1.1 },
        { header: "Calibration at use", width: 1.5 },
      ],
      model.instruments.map((i) => [`${i.kind}: ${i.name}`, i.serial, dateText(i.calibratedOn), dateText(i.calibrationDueOn), i.certificateNumber || "—", { text: i.state, color: i.state === "current" ? INK : WARN }]),
    );

  // ---- Photos ------------------------------------------------------------------------------------
  section("Photos of traverse locations");
  const shown = model.photos.filter((p) => p.base64);
  if (shown.length === 0) flow.text("No photos of traverse locations were attached.", { size: 9.5 });
  const gap = 16;
  const cellW = (flow.contentWidth - gap) / 2;
  const imgH = cellW * 0.72;
  for (let k = 0; k < shown.length; k += 2) {
    flow.ensure(imgH + 34);
    const rowTop = flow.y;
    for (const [j, photo] of shown.slice(k, k + 2).entries()) {
      const x = geo.left + j * (cellW + gap);
      try {
        // A fresh array: pdf-lib reads the image through its ArrayBuffer from offset 0, and Node's pooled Buffers do not start there.
        const bytes = Uint8Array.from(Buffer.from(photo.base64!, "base64"));
        const image = photo.format === "png" ? await doc.embedPng(bytes) : await doc.embedJpg(bytes);
        const s = Math.min(cellW / image.width, imgH / image.height);
        const w = image.width * s;
        const h = image.height * s;
        flow.page.drawRectangle({ x, y: rowTop - imgH, width: cellW, height: imgH, color: rgb(0.97, 0.97, 0.97) });
        flow.page.drawImage(image, { x: x + (cellW - w) / 2, y: rowTop - imgH + (imgH - h) / 2, width: w, height: h });
      } catch {
        fonts.regular.draw(flow.page, fonts.regular.fit("The image could not be read."), { x, y: rowTop - 20, size: 9, color: WARN });
      }
      const caption = `${photo.systemTag} / ${photo.sectionTag}${photo.caption ? `: ${photo.caption}` : ""} (${[photo.takenBy, dateText(photo.takenAt)].filter(Boolean).join(", ")})`;
      wrap(fonts.regular, 8, caption, cellW)
        .slice(0, 2)
        .forEach((line, n) => fonts.regular.draw(flow.page, line, { x, y: rowTop - imgH - 11 - n * 10, size: 8, color: INK }));
    }
    flow.y = rowTop - imgH - 34;
  }
  const missingPhotos = model.photos.length - shown.length;
  if (missingPhotos > 0) flow.text(`${missingPhotos} photo${missingPhotos === 1 ? " was" : "s were"} not available from storage when this report was built.`, { size: 8.5, color: WARN });

  // ---- Cautions and limits -----------------------------------------------------------------------
  section("Cautions and limits");
  flow.box("Site safety", [...SAFETY_CAUTIONS, SAFETY_FOOTNOTE], { color: WARN });
  flow.box("For the engineer of record's review", [REVIEW_STATEMENT]);
  flow.box("Air side only", [AIR_SIDE_NOTE]);
  flow.box("What the file's signature proves", [SIGNATURE_LIMITS]);

  // ---- Verification sample -----------------------------------------------------------------------
  section("Verification sample");
  const v = model.verification;
  if (!v.recorded) flow.text("No verification sample recorded.", { size: 10 });
  else {
    flow.facts(
      [
        ["Verified by", `${v.by}, ${dateText(v.at)}`],
        ["Sample", v.sampleSize],
        ["Tolerance", v.tolerance],
        ["Result", v.result === "passed" ? "Passed" : "Failed"],
      ],
      2,
    );
    flow.space(4);
    flow.table(
      [
        { header: "Item", width: 1.6 },
        { header: `Reported, ${flowUnit}`, width: 1.2, align: "right" },
        { header: `Verified, ${flowUnit}`, width: 1.2, align: "right" },
        { header: "Difference", width: 1, align: "right" },
        { header: "Result", width: 1 },
      ],
      v.items.map((it) => [it.item, formatQuantity(u, "flow", it.reportedM3S, { withUnit: false }), formatQuantity(u, "flow", it.verifiedM3S, { withUnit: false }), pct(it.differencePct, 1), it.pass ? "Agrees" : "Differs"]),
    );
    if (v.comment) flow.text(v.comment, { size: 9 });
  }

  // ---- Approvals ---------------------------------------------------------------------------------
  section("Approvals");
  flow.text(
    model.kind === "draft"
      ? "Approvals are recorded in the app against the report's content; a change of data after an approval voids it. Approvals so far:"
      : "The people whose approvals and signatures in the app stand behind this revision:",
    { size: 9.5 },
  );
  flow.space(4);
  if (model.approvals.length === 0) flow.text("None yet.", { size: 10 });
  else
    flow.table(
      [
        { header: "Name", width: 1.6 },
        { header: "As", width: 1.6 },
        { header: "What", width: 2.6 },
        { header: "When", width: 1.5 },
      ],
      model.approvals.map((a) => [{ text: a.name, weight: "semibold" }, a.role, a.what, timeText(a.at)]),
    );
  flow.space(10);
  flow.text(AIR_SIDE_NOTE, { size: 9.5, weight: "medium" });

  // ---- Contents, then the furniture of every page ------------------------------------------------
  drawContents(flow, contentsPageIndex, contents);
  const total = flow.pages.length;
  flow.pages.forEach((page, i) => decoratePage(flow, page, i + 1, total, model));

  const date = options.documentDate ?? new Date(model.generatedAt);
  doc.setTitle(`${title} — ${model.project.name}${model.revision ? `, revision ${model.revision}` : ""}`);
  doc.setSubject(model.kind === "draft" ? DRAFT_MARK : `Verification code ${model.code}`);
  doc.setCreator("Airtally");
  doc.setProducer("Airtally");
  doc.setCreationDate(date);
  doc.setModificationDate(date);
  deflatePageContents(doc);
  return doc.save();
}

function summaryCells(r: SummaryRow, u: UnitSystem): Cell[] {
  const status = r.excluded ? "Not approved — excluded" : STATUS_WORDS[r.status];
  return [
    { text: `${"  ".repeat(Math.min(r.depth, 4))}${r.tag}`, weight: r.depth === 0 ? "semibold" : "regular" },
    r.location || "—",
    { text: status, color: r.excluded || r.status === "returned" ? WARN : r.status === "approved" ? INK : SOFT },
    formatQuantity(u, "flow", r.designM3S, { withUnit: false }),
    r.measuredM3S === null ? "—" : formatQuantity(u, "flow", r.measuredM3S, { withUnit: false }),
    pct(r.pctOfDesign),
    r.band,
    { text: verdictWord(r.pass), weight: "semibold", color: r.pass === false ? WARN : INK },
  ];
}

function renderTraverse(flow: Flow, t: ReportTraverse, u: UnitSystem, kind: ReportModel["kind"]): void {
  const q = (quantity: Parameters<typeof formatQuantity>[1], value: number, opts?: { decimals?: number }) => formatQuantity(u, quantity, value, opts);
  const ductText = t.duct.shape === "round" ? `Round, ${q("dimension", t.duct.diameterMm)} diameter` : `Rectangular, ${q("dimension", t.duct.widthMm)} × ${q("dimension", t.duct.heightMm)}`;
  flow.text(`${t.location || "Location not given"}. ${kind === "draft" ? `Review: ${STATUS_WORDS[t.status]}.` : "Approved."}`, { size: 9.5, color: t.status === "approved" ? SOFT : WARN });
  flow.space(4);
  flow.facts(
    [
      ["Duct", ductText],
      ["Layout", `${t.rule}, ${t.lines} × ${t.pointsPerLine} points`],
      ["Readings", t.readingsKind === "velocity_pressure" ? "Pitot velocity pressures" : t.readingsKind === "velocity_actual" ? "Anemometer, actual velocity" : "Anemometer, standard velocity"],
      ["Taken", `${t.takenBy ?? "—"}, ${timeText(t.takenAt)}`],
      ["Integration", t.integration],
    ],
    2,
    8.6,
  );
  flow.facts([["Instruments", t.instruments.join("; ") || "—"]], 1, 8.6);
  flow.space(6);
  // Drawing and chart side by side.
  const box = 150;
  const chartH = 168;
  flow.ensure(chartH + 8);
  const top = flow.y;
  flow.fonts.semibold.draw(flow.page, "Cross-section: ports (squares) and points numbered", { x: flow.geo.left, y: top - 8, size: 7, color: SOFT });
  drawCrossSection(flow.page, flow.fonts, t, flow.geo.left, top - 14, box);
  const chartX = flow.geo.left + box + 24;
  drawProfileChart(flow.page, flow.fonts, t, u, chartX, top, flow.geo.right - chartX, chartH);
  flow.y = top - chartH - 6;

  flow.heading("Results", 3, 70);
  flow.facts(
    [
      ["Dry-bulb", q("temperature", t.air.dryBulbC)],
      ["Relative humidity", `${t.air.relativeHumidityPct.toFixed(0)} %`],
      ["Barometric", `${q("barometric", t.air.barometricPa)} (${t.air.barometricSource === "measured" ? "measured" : "from site altitude"})`],
      ["Duct static", t.air.staticAssumed ? "not measured, 0 assumed" : q("pressure", t.air.staticPa)],
      ["Air density", q("density", t.densityKgM3)],
      ["Mean velocity", q("velocity", t.meanVelocityMS)],
      ["Actual airflow", q("flow", t.flowM3S)],
      ["Standard airflow", `${q("flow", t.standardFlowM3S)} at ${q("density", t.standardDensityKgM3)}`],
      ["Mass flow", q("massFlow", t.massFlowKgS)],
      ["Design airflow", `${q("flow", t.designM3S)}; ${pct(t.pctOfDesign)} of design, ${verdictWord(t.pass).toLowerCase()} (${t.band})`],
      ["Uncertainty", `${t.uncertainty} of standard airflow`],
      ["Traverse plane", `${t.verdict === "good" ? "Good" : t.verdict === "marginal" ? "Marginal" : "Poor"}`],
    ],
    2,
    8.8,
  );
  if (t.verdictReasons.length > 0) flow.text(`Plane: ${t.verdictReasons.join(" ")}`, { size: 8.5 });
  if (t.warnings.length > 0) flow.text(`Warnings: ${t.warnings.join(" ")}`, { size: 8.5, color: WARN });
  if (t.notes) flow.text(`Technician's notes: ${t.notes}`, { size: 8.5, color: SOFT });
  if (t.review)
    flow.text(`Reviewed by ${t.review.by}, ${timeText(t.review.at)}${t.review.witnessed ? ", witnessed" : ""}${t.review.comment ? `: ${t.review.comment}` : "."}`, { size: 8.5, color: SOFT });
  flow.space(4);

  flow.heading("Readings", 3, 50);
  renderReadings(flow, t, u);
}

/**
 * The readings: one row per point position (its insertion depth is the same on every line), one
 * column per traverse line with the reading and the velocity, while the lines fit across the page;
 * a row per point beyond that.
 */
function renderReadings(flow: Flow, t: ReportTraverse, u: UnitSystem): void {
  const unitOf = (quantity: Parameters<typeof formatQuantity>[1]) => formatQuantity(u, quantity, 1).replace(/^[\d.,]+ /, "");
  const readingUnit = t.readingsKind === "velocity_pressure" ? unitOf("pressure") : unitOf("velocity");
  const readingText = (v: number | null) => (v === null ? "not read" : t.readingsKind === "velocity_pressure" ? formatQuantity(u, "pressure", v, { withUnit: false }) : formatQuantity(u, "velocity", v, { withUnit: false }));
  const velocityText = (p: ReportTraverse["points"][number]) =>
    p.velocityMS !== null ? formatQuantity(u, "velocity", p.velocityMS, { withUnit: false }) : p.filledVelocityMS !== null ? `${formatQuantity(u, "velocity", p.filledVelocityMS, { withUnit: false })}*` : "—";
  const mark = (p: ReportTraverse["points"][number]) => (p.beyondReach ? "†" : "");
  const what = t.readingsKind === "velocity_pressure" ? "velocity pressure" : "velocity read";
  if (t.lines <= 6) {
    flow.text(`Each line's cell: ${what} (${readingUnit}) / velocity (${unitOf("velocity")}).`, { size: 8, color: SOFT });
    const columns = [
      { header: "Point", width: 0.55, align: "right" as const },
      { header: `Depth, ${unitOf("dimension")}`, width: 0.8, align: "right" as const },
      ...Array.from({ length: t.lines }, (_, k) => ({ header: `Line ${k + 1}`, width: 1.25, align: "right" as const })),
    ];
    const rows: Cell[][] = [];
    for (let i = 0; i < t.pointsPerLine; i++) {
      const first = t.points.find((p) => p.point === i);
      const row: Cell[] = [String(i + 1), first ? formatQuantity(u, "dimension", first.depthMm, { withUnit: false }) : "—"];
      for (let k = 0; k < t.lines; k++) {
        const p = t.points.find((x) => x.line === k && x.point === i);
        row.push(p ? `${readingText(p.reading)} / ${velocityText(p)}${mark(p)}` : "—");
      }
      rows.push(row);
    }
    flow.table(columns, rows, { size: 7.8, width: Math.min(flow.contentWidth, 110 + t.lines * 85) });
  } else {
    flow.table(
      [
        { header: "Line", width: 0.6, align: "right" },
        { header: "Point", width: 0.6, align: "right" },
        { header: `Insertion depth, ${unitOf("dimension")}`, width: 1.2, align: "right" },
        { header: `${what[0]!.toUpperCase()}${what.slice(1)}, ${readingUnit}`, width: 1.5, align: "right" },
        { header: `Velocity, ${unitOf("velocity")}`, width: 1.1, align: "right" },
      ],
      t.points.map((p) => [String(p.line + 1), String(p.point + 1), formatQuantity(u, "dimension", p.depthMm, { withUnit: false }), readingText(p.reading), `${velocityText(p)}${mark(p)}`]),
      { size: 7.8 },
    );
  }
  const notes = [
    t.points.some((p) => p.reading === null && p.filledVelocityMS !== null) ? "* not read: velocity filled from its counterpart for the mean." : "",
    t.points.some((p) => p.beyondReach) ? "† closer to the wall than the probe head reaches: read at the probe's reach." : "",
  ].filter(Boolean);
  if (notes.length > 0) flow.text(notes.join(" "), { size: 8, color: SOFT });
}

function drawContents(flow: Flow, pageIndex: number, contents: ContentsEntry[]): void {
  const page = flow.pages[pageIndex]!;
  const { fonts, geo } = flow;
  let y = geo.top;
  fonts.bold.draw(page, "Contents", { x: geo.left, y: y - 17, size: 17, color: ACCENT });
  y -= 24;
  page.drawLine({ start: { x: geo.left, y }, end: { x: geo.right, y }, thickness: 0.8, color: ACCENT });
  y -= 12;
  const fixed = [
    { title: "Cover", level: 1 as const, page: 1 },
    { title: "Certification by the TAB supervisor", level: 1 as const, page: 2 },
  ];
  const all = [...fixed, ...contents.filter((c) => c.title !== "Certification by the TAB supervisor")];
  // One contents page holds this many lines; the rest are summarised rather than spilling over.
  const room = Math.floor((y - geo.bottom) / 15);
  const list = all.length > room ? [...all.slice(0, room - 1), { title: `… and ${all.length - room + 1} more parts`, level: 2 as const, page: 0 }] : all;
  for (const entry of list) {
    const size = entry.level === 1 ? 10.5 : 9.5;
    const font = entry.level === 1 ? fonts.semibold : fonts.regular;
    const x = geo.left + (entry.level === 1 ? 0 : 16);
    const number = entry.page > 0 ? String(entry.page) : "";
    const nw = font.width(number, size);
    const titleText = wrap(font, size, entry.title, geo.right - x - 60)[0]!;
    const tw = font.width(titleText, size);
    font.draw(page, titleText, { x, y: y - size, size, color: INK });
    if (number) {
      font.draw(page, number, { x: geo.right - nw, y: y - size, size, color: INK });
      // Dotted leader from the title to the page number.
      page.drawLine({ start: { x: x + tw + 6, y: y - size + 1.5 }, end: { x: geo.right - nw - 6, y: y - size + 1.5 }, thickness: 0.6, color: RULE, dashArray: [0.6, 2.4] });
    }
    y -= entry.level === 1 ? 16 : 14;
  }
}

function decoratePage(flow: Flow, page: ReturnType<Flow["newPage"]>, n: number, total: number, model: ReportModel): void {
  const { fonts, geo } = flow;
  const headY = geo.height - 40;
  const left = fonts.semibold.fit(`Closeout report · ${model.project.name}`);
  fonts.semibold.draw(page, wrap(fonts.semibold, 8.5, left, (geo.right - geo.left) * 0.62)[0]!, { x: geo.left, y: headY, size: 8.5, color: INK });
  const right = model.kind === "draft" ? DRAFT_MARK : `Revision ${model.revision} · ${model.code}`;
  const rf = model.kind === "draft" ? fonts.bold : fonts.medium;
  const rightText = rf.fit(right);
  rf.draw(page, rightText, { x: geo.right - rf.width(rightText, 8.5), y: headY, size: 8.5, color: model.kind === "draft" ? WARN : SOFT });
  page.drawLine({ start: { x: geo.left, y: headY - 7 }, end: { x: geo.right, y: headY - 7 }, thickness: 0.5, color: RULE });

  const qr = 46;
  const footTop = geo.bottom - 14;
  page.drawLine({ start: { x: geo.left, y: footTop }, end: { x: geo.right, y: footTop }, thickness: 0.5, color: RULE });
  drawQr(page, model.verifyUrl, geo.right - qr, footTop - 6, qr);
  const textWidth = geo.right - geo.left - qr - 12;
  const lines =
    model.kind === "draft"
      ? [`${DRAFT_MARK}: no verification code. Issued reports are checked at ${model.verifyUrl}`, `${model.project.siteName} · air side only · generated ${timeText(model.generatedAt)}`]
      : [`Verify at ${model.verifyUrl}`, `Verification code ${model.code} · ${model.project.siteName} · air side only`];
  let y = footTop - 14;
  for (const line of lines) {
    for (const part of wrap(fonts.regular, 7.5, line, textWidth).slice(0, 2)) {
      fonts.regular.draw(page, part, { x: geo.left, y, size: 7.5, color: SOFT });
      y -= 9.5;
    }
  }
  const pageText = `Page ${n} of ${total}`;
  fonts.semibold.draw(page, pageText, { x: geo.left, y: footTop - 48, size: 8.5, color: INK });

  if (model.kind === "draft") {
    const size = 54;
    const w = fonts.bold.width(DRAFT_MARK, size);
    const angle = 32;
    const rad = (angle * Math.PI) / 180;
    // Turned and translucent: pdf-lib's own text drawing, which sets up the transparency.
    page.drawText(DRAFT_MARK, {
      x: geo.width / 2 - (w / 2) * Math.cos(rad) + (size / 3) * Math.sin(rad),
      y: geo.height / 2 - (w / 2) * Math.sin(rad) - (size / 3) * Math.cos(rad),
      size,
      font: fonts.bold.embedded,
      color: WARN,
      opacity: 0.1,
      rotate: degrees(angle),
    });
  }
}
