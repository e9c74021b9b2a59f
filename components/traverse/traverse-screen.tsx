"use client";

/**
 * The traverse on the technician's tablet: the cross-section with numbered points and insertion depths,
 * the grid, and live results beside the operating conditions. Every keystroke goes through
 * useOfflineDraft (`traverse:<id>`): kept on this device at once, sent as one versioned PUT of the whole
 * grid when the network is there. A version conflict shows both grids and waits for a choice. The
 * engine runs in the browser for the live numbers; once saved, the server's result is shown (the same
 * calculation through the same input mapping).
 *
 * What the first paint needs comes with the page: the plane, the grid, the results as the server
 * computed them. The engine (needed only once something is typed), the chart, the air editor and the
 * editors behind a button or a closed panel arrive after the page is up (later-parts.ts), each in its
 * own small task, and are kept on the device for use without network.
 */
import { useCallback, useDeferredValue, useEffect, useId, useMemo, useRef, useState } from "react";
import { SyncStatus } from "@/components/offline/sync-status";
import { draftOf, readingsRequest, traverseDraftKey, type Traverse, type TraverseDraft } from "@/lib/api-client/traverses";
import { summarizeConditions } from "@/lib/airflow/conditions-summary";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import type { Grid, PointRef } from "@/lib/traverse/engine-input";
import { plausibilityFlags } from "@/lib/traverse/plausibility";
import type { TraversePointJson, TraverseResultJson } from "@/lib/traverse/result-types";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import { buttonClasses } from "@/components/ui/button";
import { laterPart } from "@/components/ui/later-part";
import { SubmitPanel } from "@/components/review/submit-panel";
import { traverseSubmissionProblemsOf } from "@/lib/review/submission";
import { fetchAfterLoad, loadAirEditor, loadChart, loadGridConflict, loadKitEditor, loadLiveEngine, loadLiveResults, loadMeterImport, loadVelocityViews } from "./later-parts";
import { resultsHeadingId } from "./results-heading";
import { ReadingGrid } from "./reading-grid";
import { useLiveEngine } from "./use-live-engine";

const OFFLINE_NOTE = "The readings, the results and what you type keep working; reload the page when the connection returns.";
const AirEditor = laterPart(loadAirEditor, (m) => m.AirEditor, {
  loading: "Loading the air editor…",
  unavailable: `The air editor could not be loaded without network. ${OFFLINE_NOTE}`,
});
const KitEditor = laterPart(loadKitEditor, (m) => m.KitEditor, {
  loading: "Loading the instruments and conditions…",
  unavailable: `The instruments and conditions could not be loaded without network. ${OFFLINE_NOTE}`,
});
const LiveResults = laterPart(loadLiveResults, (m) => m.LiveResults, {
  loading: "Loading the results…",
  unavailable: `The results could not be shown without network. ${OFFLINE_NOTE}`,
});
const VelocityViews = laterPart(loadVelocityViews, (m) => m.VelocityViews, {
  loading: "Drawing the velocity map and profile…",
  unavailable: `The velocity map and profile could not be loaded without network. ${OFFLINE_NOTE}`,
});
const GridConflict = laterPart(loadGridConflict, (m) => m.GridConflict, {
  loading: "Another version of these readings is on the server: loading both to compare…",
  unavailable: `Another version of these readings is on the server, and the comparison could not be loaded without network. Nothing has been overwritten; reload the page when the connection returns.`,
});
const MeterImport = laterPart(loadMeterImport, (m) => m.MeterImport, {
  loading: "Loading the meter import…",
  unavailable: `The meter import could not be loaded without network. ${OFFLINE_NOTE}`,
});

export interface TraverseScreenProps {
  projectId: string;
  initial: Traverse;
  units: UnitSystem;
  /** The signed-in user may record readings (technicians); others see the traverse read-only. */
  canRecord: boolean;
  tolerance: { minusPct: number; plusPct: number };
  /** The insertion depths beside the drawing (components/traverse/insertion-depths.tsx), drawn by the server: they never change on the tablet. */
  insertionDepths: React.ReactNode;
  /**
   * The results of `initial` as the server drew them (components/traverse/live-results.tsx, with
   * `resultsHeadingId`), shown while they are current: the same component draws newer ones on the
   * tablet, so the page does not carry it in its first load.
   */
  initialResults: React.ReactNode;
  /** The plane (components/traverse/cross-section.tsx without values), drawn by the server; the point being typed at is marked on it here. */
  plane: React.ReactNode;
  /** The velocity map and profile of `initial` (components/traverse/velocity-views.tsx), drawn by the server, shown while current. */
  initialViews: React.ReactNode;
}

export function TraverseScreen({ projectId, initial, units, canRecord, tolerance, insertionDepths, initialResults, plane, initialViews }: TraverseScreenProps) {
  const resultsId = useId();
  const resultsRef = useRef<HTMLHeadingElement>(null);
  const editable = canRecord && (initial.status === "draft" || initial.status === "returned");
  const toRequest = useCallback((d: TraverseDraft) => readingsRequest(projectId, initial.id, d), [projectId, initial.id]);
  const draft = useOfflineDraft<TraverseDraft, Traverse>({
    key: traverseDraftKey(initial.id),
    initial: draftOf(initial),
    initialVersion: initial.version,
    initialServer: initial,
    toRequest: editable ? toRequest : undefined,
    fromServer: draftOf,
  });
  const server = draft.server ?? initial;
  const value = draft.value;
  const [focused, setFocused] = useState<string | null>(null);
  // The plane is the server's drawing: the point being typed at is marked on it here (app/globals.css draws the mark).
  const planeRef = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const point = focused ? planeRef.current?.querySelector(`[data-point="${focused}"]`) : null;
    point?.setAttribute("data-focused", "");
    return () => point?.removeAttribute("data-focused");
  }, [focused]);
  const [changingKit, setChangingKit] = useState(false);
  // The meter import stays in place once opened, so closing the panel keeps a file being looked at.
  const [importOpened, setImportOpened] = useState(false);
  // Not in the first load, but fetched once the page is up, so every part is on the device (and kept by
  // the service worker) before the network goes.
  useEffect(() => fetchAfterLoad(editable ? [loadLiveEngine, loadLiveResults, loadVelocityViews, loadChart, loadAirEditor, loadMeterImport, loadKitEditor, loadGridConflict] : [loadChart]), [editable]);
  const round = server.section.shape === "round";
  const quantity = server.readingsKind === "velocity_pressure" ? ("pressure" as const) : ("velocity" as const);

  const synced = draft.syncState === "saved" && server.version === draft.version;
  // The server's result stands for what it has; the tablet computes only what it does not have yet.
  const { engine, failed: engineFailed } = useLiveEngine({ soon: editable, now: !synced });

  // The same engine source the server builds, with the air and readings held on this device.
  const air = value.air ?? { dryBulbC: server.air.dryBulbC, relativeHumidityPct: server.air.relativeHumidityPct, wetBulbC: server.air.wetBulbC, staticPa: server.air.staticPa, barometricPa: server.air.barometricPa };
  const live = useMemo(() => {
    if (synced || !engine) return null;
    const source = engine.engineSourceOf(
      {
        method: server.method,
        lines: server.lines,
        pointsPerLine: server.pointsPerLine,
        portOffsetMm: server.portOffsetMm,
        readingsKind: server.readingsKind,
        probeCoefficient: server.instrument.probeCoefficient,
        probeHeadDiameterMm: server.instrument.probeHeadDiameterMm,
        instrumentAccuracy: server.instrument.accuracy as Record<string, number>,
        instrumentStandardDensityKgM3: value.instrument.standardDensityKgM3,
        dryBulbC: air.dryBulbC,
        relativeHumidityPct: air.relativeHumidityPct,
        wetBulbC: air.wetBulbC,
        barometricPa: air.barometricPa,
        staticPa: air.staticPa,
      },
      server.section,
      server.project,
    );
    const reduction = engine.reduceTraverseSource(source, value.readings, value.unreadable);
    return { ...reduction, result: reduction.ok ? (engine.camelKeys(reduction.output) as TraverseResultJson) : null };
  }, [synced, engine, server, value.readings, value.unreadable, value.instrument.standardDensityKgM3, air.dryBulbC, air.relativeHumidityPct, air.wetBulbC, air.barometricPa, air.staticPa]);

  const result: TraverseResultJson | null = synced ? server.result : (live?.result ?? null);
  const shownResult = result ? { ...result, counts: result.counts ?? live?.counts } : null;
  const problem = synced ? server.resultError?.message : live && !live.ok ? live.message : null;
  // Typed values the server has not computed yet, and the engine is still on its way.
  const awaitingEngine = !synced && !live;

  const points = useMemo(() => new Map<string, TraversePointJson>((result?.points ?? []).map((p) => [`${p.line}:${p.point}`, p])), [result]);
  const reading = server.instrument.reading;
  const flags = useMemo(
    () => plausibilityFlags(value.readings, { kind: quantity, rangeMin: reading?.rangeMin ?? null, rangeMax: reading?.rangeMax ?? null, format: (v) => formatQuantity(units, quantity, v) }),
    [value.readings, quantity, reading?.rangeMin, reading?.rangeMax, units],
  );
  const layout = server.layout;
  const depths = layout ? layout.lines.map((l) => l.points.map((p) => p.depthMm)) : [];
  const { diameterMm, widthMm, heightMm } = server.section;
  const duct = useMemo(
    () => (round ? { shape: "round" as const, diameterMm: diameterMm ?? 0 } : { shape: "rectangular" as const, widthMm: widthMm ?? 0, heightMm: heightMm ?? 0 }),
    [round, diameterMm, widthMm, heightMm],
  );
  // The map and the chart follow the readings at a lower priority than the cell being typed in and the
  // live figures: React draws them once the key press has been answered (and skips them while typing
  // goes on), so each key press re-renders only the grid and the results.
  const deferredResult = useDeferredValue(result);
  const deferredUnreadable = useDeferredValue(value.unreadable);
  // What the server drew (results, map and chart) stands while it is current.
  const showsInitial = synced && server.version === initial.version;
  const views =
    showsInitial && initialViews ? (
      initialViews
    ) : deferredResult && layout && deferredResult.points.some((p) => p.velocityMS !== null) ? (
      <VelocityViews points={deferredResult.points} unreadable={deferredUnreadable} layout={layout} duct={duct} units={units} sectionTag={server.sectionTag} lines={server.lines} round={round} />
    ) : null;
  const hasReadings = value.readings.some((row) => row.some((v) => v !== null));

  const setGrid = (next: { readings: Grid; unreadable: PointRef[] }) => draft.setValue((prev) => ({ ...prev, readings: next.readings, unreadable: next.unreadable }));
  const conditions = server.conditions;

  return (
    <div className="grid gap-gutter">
      {editable && (
        <SyncStatus
          syncState={draft.syncState}
          error={draft.error}
          nextAttemptAt={draft.nextAttemptAt}
          online={draft.online}
          deviceError={draft.deviceError}
          retry={draft.retry}
          what="the readings"
          className="sticky top-0 z-10"
        />
      )}
      {canRecord && (
        <SubmitPanel
          what={`the traverse of ${server.sectionTag}`}
          // Status and decisions change only by submission and review, which reload the page: the page's value is current.
          status={initial.status}
          problems={traverseSubmissionProblemsOf(server)}
          pendingOnDevice={draft.syncState !== "saved"}
          online={draft.online}
          lastReview={initial.lastReview}
          // The review client is fetched on the press: a submission needs the network anyway.
          onSubmit={() => import("@/lib/api-client/review").then(({ reviewApi }) => reviewApi.submitTraverse(projectId, initial.id))}
        />
      )}
      {!canRecord && initial.lastReview && (
        <p role="note" className="rounded-card border border-line-strong bg-paper-sunk p-3">
          {initial.lastReview.decision === "approved" ? "Approved" : "Returned"} by {initial.lastReview.reviewerName ?? "the commissioning agent"}
          {initial.lastReview.comment ? `: “${initial.lastReview.comment}”` : "."}
        </p>
      )}
      {!editable && (
        <p role="note" className="rounded-card border border-line-strong bg-paper-sunk p-3">
          {canRecord
            ? `This traverse was ${server.status === "approved" ? "approved" : "submitted for review"}: its readings are locked. Start a re-traverse of ${server.sectionTag} to take new readings.`
            : "Read only: technicians record traverses."}
        </p>
      )}
      {draft.conflict && (
        <GridConflict conflict={draft.conflict} what={`readings of ${server.sectionTag}`} onChoose={(c) => draft.resolveConflict(c)} quantity={quantity} units={units} round={round} />
      )}

      <section aria-labelledby={`${resultsId}-plane`} className="grid gap-4 rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id={`${resultsId}-plane`}>Plane and probe marks</h2>
        {layout ? (
          <div className="grid gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
            <div ref={planeRef}>{plane}</div>
            {insertionDepths}
          </div>
        ) : (
          <p className="text-fault">The layout could not be drawn.</p>
        )}
        {layout?.warnings.map((w) => (
          <p key={w} className="text-sm font-semibold text-caution">
            ▲ {w}
          </p>
        ))}
      </section>

      <div className="grid gap-gutter xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <section aria-labelledby={`${resultsId}-grid`} className="grid content-start gap-3 rounded-card border border-line bg-paper-raised p-gutter">
          <h2 id={`${resultsId}-grid`}>Readings</h2>
          <p className="text-sm text-ink-soft">
            {quantity === "pressure" ? "Velocity pressure" : server.readingsKind === "velocity_standard" ? "Standard velocity" : "Velocity"} at each point, in {formatQuantity(units, quantity, 0).replace(/^[-\d.,\s]+/, "")}.
            {editable && " Enter moves to the next point. Mark a point the probe cannot reach (an obstruction) as unreadable: the engine integrates around it."}
          </p>
          <ReadingGrid
            readings={value.readings}
            unreadable={value.unreadable}
            quantity={quantity}
            units={units}
            depthsMm={depths}
            points={points}
            flags={flags}
            round={round}
            onChange={editable ? setGrid : null}
            onFinished={() => resultsRef.current?.focus()}
            onFocusPoint={setFocused}
          />
          {editable && (
            <details className="rounded-card border border-line p-3" onToggle={(e) => e.currentTarget.open && setImportOpened(true)}>
              <summary className="min-h-touch cursor-pointer py-2 font-semibold">Import readings from a meter&apos;s file</summary>
              {importOpened && (
                <MeterImport
                  lines={server.lines}
                  pointsPerLine={server.pointsPerLine}
                  kind={quantity}
                  units={units}
                  round={round}
                  hasReadings={hasReadings}
                  onAccept={(grid) =>
                    draft.setValue((prev) => ({
                      ...prev,
                      readings: grid,
                      // A point the file gives a value for is read after all.
                      unreadable: prev.unreadable.filter(([k, i]) => grid[k]?.[i] === null),
                    }))
                  }
                />
              )}
            </details>
          )}
        </section>

        <section aria-labelledby={`${resultsId}-results`} className="grid content-start gap-3 rounded-card border border-line bg-paper-raised p-gutter">
          <h2 id={`${resultsId}-results`} ref={resultsRef} tabIndex={-1}>
            Results
          </h2>
          {shownResult && synced && server.version === initial.version && initialResults ? (
            initialResults
          ) : shownResult ? (
            <LiveResults result={shownResult} units={units} designFlowM3S={server.section.designFlowM3S} tolerance={tolerance} source={synced ? { kind: "server", version: server.version } : { kind: "tablet", version: null }} headingId={resultsHeadingId(initial.id)} />
          ) : awaitingEngine ? (
            <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft" aria-live="polite">
              {engineFailed
                ? "The results are worked out on this tablet, and the part that does it could not be loaded without network. What you type is kept on this tablet and sent when the connection returns; reload the page then to see the results."
                : "Working out the results on this tablet…"}
            </p>
          ) : (
            <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft" aria-live="polite">
              {problem ?? "No readings yet."} {problem === "No readings yet." || !problem ? "Results appear as soon as the first value lands." : ""}
            </p>
          )}
          <div className="rounded-card border border-line bg-paper p-3">
            <h3 className="font-semibold">Operating conditions</h3>
            {conditions ? (
              <p>
                {summarizeConditions(
                  { fanSpeedRpm: conditions.fanSpeedRpm, vfdHz: conditions.vfdHz, boxes: conditions.boxes, outsideAirDamperPct: conditions.outsideAirDamperPct, ductStaticSetpointPa: conditions.ductStaticSetpointPa, filterState: conditions.filterState },
                  (pa) => formatQuantity(units, "pressure", pa),
                )}
              </p>
            ) : (
              <p className="text-caution">No operating conditions recorded with these readings: they cannot be compared with other readings without a warning.</p>
            )}
          </div>
        </section>
      </div>

      {views}

      {editable && (
        <section aria-labelledby={`${resultsId}-air`} className="grid gap-3 rounded-card border border-line bg-paper-raised p-gutter">
          <h2 id={`${resultsId}-air`}>Air at the plane</h2>
          <AirEditor air={value.air} units={units} altitudeM={server.project.altitudeM} onChange={(a) => draft.setValue((prev) => ({ ...prev, air: a }))} />
        </section>
      )}
      {editable && (
        <section aria-labelledby={`${resultsId}-kit`} className="grid gap-3 rounded-card border border-line bg-paper-raised p-gutter">
          <h2 id={`${resultsId}-kit`}>Instruments and operating conditions</h2>
          {changingKit ? (
            <KitEditor
              projectId={projectId}
              traverse={server}
              value={value}
              units={units}
              onChange={(patch) => draft.setValue((prev) => ({ ...prev, ...patch, instrument: { ...prev.instrument, ...patch.instrument } }))}
            />
          ) : (
            <div>
              <button type="button" className={buttonClasses("secondary")} onClick={() => setChangingKit(true)}>
                Change instruments or conditions
              </button>
            </div>
          )}
        </section>
      )}
    </div>
  );
}
