import type { Metadata } from "next";
import Link from "next/link";
import { BalancingAids } from "@/components/airflow/balancing-aids";
import { ductSize } from "@/components/airflow/format";
import { JunctionBalanceChart, TerminalPctChart } from "@/components/engineer/charts";
import { DeviationAction } from "@/components/engineer/deviation-actions";
import { badgeStatusOf, ResultBadge } from "@/components/engineer/result-badge";
import { Card, EmptyState } from "@/components/ui/card";
import { LocalTime } from "@/components/ui/local-time";
import { NotAllowed } from "@/components/ui/not-allowed";
import { StatusBadge } from "@/components/ui/status";
import type { AcceptedDeviation } from "@/db/schema";
import { formatExpandedUncertainty } from "@/lib/airflow/uncertainty";
import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import { requireProjectPage } from "@/lib/auth/guards";
import { can } from "@/lib/auth/policy";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { loadSystemDetails, resultKey, type JudgedResult, type SystemDetail } from "@/lib/server/system-view";
import { SETPOINT_LABELS } from "@/lib/terminals/setpoints";
import { displayUnit, formatQuantity, toDisplay, unitSystemFor, type UnitSystem } from "@/lib/units";

export const metadata: Metadata = { title: "Design vs measured" };

const KIND_LABEL = { supply: "Supply", return: "Return", exhaust: "Exhaust", outside_air: "Outside air" } as const;
const TERMINAL_KIND = { diffuser: "Diffuser", grille: "Grille", register: "Register", vav_box: "VAV box", constant_volume_box: "Constant-volume box" } as const;
const signedPct = (v: number, digits = 1) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(digits)} %`;
const pct1 = (v: number | null) => (v === null ? "—" : `${v.toFixed(1)} %`);

export default async function DesignVsMeasuredPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, access, allowed } = await requireProjectPage(projectId, "design.view");
  if (!allowed) return <NotAllowed what="the design comparison" />;
  const { project } = access;
  const units = unitSystemFor(user, project);
  const details = await loadSystemDetails(project);
  const mayAccept = can(user, access.role, "deviation.accept");

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <div className="space-y-1 text-ink-soft">
        <p>
          Design airflow against measured, every flow at standard air ({formatIn(FORM_UNITS[units].density, project.standardDensityKgM3, 4)}): the latest traverse of each section and the
          latest final reading of each terminal (the initial one where no final reading exists yet). Continuity is checked by mass at every junction whose trunk and branches were all
          traversed. Bands: fan {formatTolerance(toleranceFor(project, "fan"))}, sections {formatTolerance(toleranceFor(project, "section"))}, outlets{" "}
          {formatTolerance(toleranceFor(project, "outlet"))}, terminal units {formatTolerance(toleranceFor(project, "terminalUnit"))}, minimum outside air{" "}
          {formatTolerance(toleranceFor(project, "outsideAir"))}, junctions and fan against outlets ±{project.continuityTolerancePct} %.
        </p>
      </div>
      {details.length === 0 && <EmptyState>No air systems yet: add them in Set-up, by form or from a design schedule file.</EmptyState>}
      {details.map((d) => (
        <SystemCard key={d.system.id} detail={d} units={units} projectId={project.id} mayAccept={mayAccept} standardDensity={project.standardDensityKgM3} />
      ))}
    </main>
  );
}

function SystemCard({ detail, units, projectId, mayAccept, standardDensity }: { detail: SystemDetail; units: UnitSystem; projectId: string; mayAccept: boolean; standardDensity: number }) {
  const { system } = detail;
  const flow = (v: number) => formatQuantity(units, "flow", v);
  const results = new Map(detail.results.map((r) => [r.key, r]));
  const resultOf = (subject: JudgedResult["subject"], entityId: string, measure: string) => results.get(resultKey(subject, entityId, measure));
  const outside = detail.results.filter((r) => r.status === "outside");
  const flowUnit = displayUnit(units, "flow").symbol;

  return (
    <Card
      className="min-w-0"
      title={
        <span>
          {system.tag} <span className="font-normal text-ink-soft">· {system.name}</span>
        </span>
      }
      actions={<span className="text-sm text-ink-muted">{KIND_LABEL[system.kind]}{system.location ? ` · ${system.location}` : ""}</span>}
    >
      <div className="grid gap-3 lg:grid-cols-3">
        <FanTile detail={detail} units={units} result={resultOf("system", system.id, "fan")} />
        <UnaccountedTile detail={detail} units={units} result={resultOf("system", system.id, "unaccounted")} />
        <OutsideAirTile detail={detail} units={units} result={resultOf("system", system.id, "outside_air")} />
      </div>

      <h3 className="mt-6 mb-2 text-lg font-semibold">Duct tree, fan to outlets</h3>
      {detail.sections.length === 0 ? (
        <EmptyState>No duct sections in {system.tag} yet: add its trunk and branches in Set-up.</EmptyState>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full min-w-[52rem] text-left">
            <caption className="sr-only">
              {system.tag}: design against measured at every section, outlet and terminal unit, fan to outlets
            </caption>
            <thead className="border-b-2 border-line text-sm text-ink-muted">
              <tr>
                <th scope="col" className="py-2 pr-3">Item</th>
                <th scope="col" className="py-2 pr-3">Kind · size</th>
                <th scope="col" className="py-2 pr-3 text-right">Design ({flowUnit})</th>
                <th scope="col" className="py-2 pr-3 text-right">Measured, std ({flowUnit})</th>
                <th scope="col" className="py-2 pr-3 text-right">% of design</th>
                <th scope="col" className="py-2 pr-3">Band</th>
                <th scope="col" className="py-2 pr-3">Result</th>
                <th scope="col" className="py-2">Reading</th>
              </tr>
            </thead>
            <tbody>
              {detail.sections.map((row) => {
                const r = resultOf("section", row.section.id, "design");
                const terminals = detail.terminals.filter((t) => t.section.id === row.section.id);
                return [
                  <tr key={row.section.id} className="border-b border-line bg-paper">
                    <th scope="row" className="py-2 pr-3 font-semibold" style={{ paddingLeft: `${row.depth * 1.25}rem` }}>
                      {row.section.tag}
                    </th>
                    <td className="py-2 pr-3">
                      {row.section.kind === "trunk" ? "Trunk" : "Branch"} · {ductSize(row.section, units)}
                    </td>
                    <td className="num py-2 pr-3 text-right">{formatQuantity(units, "flow", row.section.designFlowM3S, { withUnit: false })}</td>
                    <td className="num py-2 pr-3 text-right">{row.reduction?.ok ? formatQuantity(units, "flow", row.reduction.result.standardFlowM3S, { withUnit: false }) : "—"}</td>
                    <td className="num py-2 pr-3 text-right">{pct1(row.pctOfDesign)}</td>
                    <td className="py-2 pr-3 text-sm whitespace-nowrap">{r?.tolerance}</td>
                    <td className="py-2 pr-3">{r && <ResultCell result={r} />}</td>
                    <td className="py-2 text-sm">
                      {row.latest ? (
                        <span className="flex flex-wrap items-center gap-1">
                          <Link href={`/projects/${projectId}/traverses/${row.latest.id}`} className="font-semibold text-accent-strong underline underline-offset-4" data-section={row.section.tag}>
                            Traverse rev. {row.latest.revision}
                          </Link>{" "}
                          <StatusBadge status={row.latest.status} />
                        </span>
                      ) : (
                        <span className="text-ink-soft">No traverse</span>
                      )}
                    </td>
                  </tr>,
                  ...terminals.flatMap((t) =>
                    t.setpoints.map((sp) => {
                      const tr = resultOf("terminal", t.terminal.id, sp.setpoint);
                      return (
                        <tr key={`${t.terminal.id}-${sp.setpoint}`} className="border-b border-line">
                          <th scope="row" className="py-2 pr-3 font-normal" style={{ paddingLeft: `${(row.depth + 1) * 1.25}rem` }}>
                            <span className="font-semibold">{t.terminal.tag}</span>
                            {t.unit && <span className="text-sm text-ink-soft"> at {SETPOINT_LABELS[sp.setpoint].toLowerCase()}</span>}
                            {t.terminal.room && <span className="block text-sm text-ink-muted">{t.terminal.room}</span>}
                          </th>
                          <td className="py-2 pr-3 text-sm">{TERMINAL_KIND[t.terminal.type]}</td>
                          <td className="num py-2 pr-3 text-right">{sp.designM3S === null ? "—" : formatQuantity(units, "flow", sp.designM3S, { withUnit: false })}</td>
                          <td className="num py-2 pr-3 text-right">{sp.reading ? formatQuantity(units, "flow", sp.reading.standardFlowM3S, { withUnit: false }) : "—"}</td>
                          <td className="num py-2 pr-3 text-right">{pct1(sp.pctOfDesign)}</td>
                          <td className="py-2 pr-3 text-sm whitespace-nowrap">{tr?.tolerance}</td>
                          <td className="py-2 pr-3">{tr && <ResultCell result={tr} />}</td>
                          <td className="py-2 text-sm">
                            {sp.reading ? (
                              <span className="flex flex-wrap items-center gap-1">
                                {sp.reading.phase === "final" ? "Final" : "Initial only"}
                                {sp.setStatus && <StatusBadge status={sp.setStatus} />}
                              </span>
                            ) : (
                              <span className="text-ink-soft">Not read</span>
                            )}
                          </td>
                        </tr>
                      );
                    }),
                  ),
                ];
              })}
            </tbody>
          </table>
        </div>
      )}

      <h3 className="mt-6 mb-2 text-lg font-semibold">Continuity by mass at junctions</h3>
      {detail.junctions.length === 0 && (
        <EmptyState>No junction to check yet: a junction appears where a section has branches. Add branches below the trunk in Set-up.</EmptyState>
      )}
      <ul className="space-y-2">
        {detail.junctions.map((j) => {
          const r = resultOf("junction", j.parent.id, "continuity");
          const differences = detail.junctionConditions.find((c) => c.parentId === j.parent.id)?.differences ?? [];
          return (
            <li key={j.parent.id} className="rounded-card border border-line p-3" data-junction={j.parent.tag}>
              <p className="flex flex-wrap items-center justify-between gap-2 font-semibold">
                <span>
                  {j.parent.tag} → {j.children.map((c) => c.tag).join(" + ")}
                </span>
                {r && <ResultCell result={r} />}
              </p>
              {j.status === "waiting" ? (
                <p className="text-ink-soft">Not checked: waiting for reduced traverses of {j.missing.join(", ")}. No partial sum is shown.</p>
              ) : (
                <>
                  <p className="num">
                    Trunk {formatQuantity(units, "massFlow", j.junction.parentMassFlowKgS)} · branches {formatQuantity(units, "massFlow", j.junction.childrenMassFlowKgS)} · imbalance{" "}
                    <strong>
                      {signedPct(j.junction.imbalancePct, 2)} by mass ({formatQuantity(units, "flow", j.junction.imbalanceStandardM3S)} standard)
                    </strong>
                    , band ±{r?.tolerance.replace("±", "")}
                  </p>
                  <p className="text-ink-soft">{j.junction.note}</p>
                  {differences.length > 0 && <ConditionsWarning messages={differences.map((x) => x.message)} />}
                </>
              )}
            </li>
          );
        })}
      </ul>

      <h3 className="mt-6 mb-2 text-lg font-semibold">Results outside their band</h3>
      {outside.length === 0 ? (
        <p className="text-ink-soft">None among the results measured so far{detail.results.some((r) => r.status === "not_measured") ? "; some are not measured yet (see above)" : ""}.</p>
      ) : (
        <ul className="space-y-2">
          {outside.map((r) => (
            <li key={r.key} className="rounded-card border border-line p-3">
              <p className="flex flex-wrap items-center justify-between gap-2">
                <span>
                  <strong>{r.label}</strong>: <span className="num">{r.value!.toFixed(1)}</span> {r.unit}, band {r.tolerance}
                </span>
                <ResultBadge status={badgeStatusOf(r.status, r.deviation !== null)} />
              </p>
              {r.deviation ? (
                <>
                  <DeviationNote deviation={r.deviation} current={r.value} />
                  {mayAccept && <DeviationAction projectId={projectId} label={r.label} mode={{ kind: "withdraw", deviationId: r.deviation.id }} />}
                </>
              ) : (
                mayAccept && <DeviationAction projectId={projectId} label={r.label} mode={{ kind: "accept", subject: r.subject, entityId: r.entityId, measure: r.measure }} />
              )}
            </li>
          ))}
        </ul>
      )}

      <Charts detail={detail} units={units} standardDensity={standardDensity} />

      <h3 className="mt-6 mb-2 text-lg font-semibold">Balancing aids</h3>
      <BalancingAids plans={detail.branchPlans} fan={detail.fan} units={units} motor={detail.motor} />
      {detail.outletPlans.length > 0 && (
        <div className="mt-4 space-y-3">
          {detail.outletPlans.map((plan) => (
            <div key={plan.branch}>
              <p className="font-semibold">Outlets on {plan.branch}, in working order (ratio = measured ÷ design, standard air)</p>
              <ol className="mt-1 list-decimal space-y-1 pl-6">
                {plan.steps.map((step) => (
                  <li key={step.id} className="num">
                    <strong>{step.id}</strong> ratio {step.ratio.toFixed(3)} —{" "}
                    {step.role === "index"
                      ? "Reference: leave fully open"
                      : step.role === "throttle"
                        ? `Throttle to ${step.targetM3S !== null ? flow(step.targetM3S) : "the reference ratio"} (ratio ${step.targetRatio?.toFixed(3)})`
                        : step.role === "leave"
                          ? "Leave: already close to the reference ratio"
                          : "Investigate: far below design"}
                  </li>
                ))}
              </ol>
            </div>
          ))}
        </div>
      )}
      {detail.outletPlansWaiting.length > 0 && (
        <p className="mt-3 text-ink-soft">
          Outlet balancing waits for readings on{" "}
          {detail.outletPlansWaiting.map((w) => `${w.branch} (${w.unread.join(", ")} not read)`).join("; ")}.
        </p>
      )}
    </Card>
  );
}

function ResultCell({ result, showMissing = true }: { result: JudgedResult; showMissing?: boolean }) {
  const status = badgeStatusOf(result.status, result.deviation !== null);
  return (
    <span className="inline-flex flex-col">
      <ResultBadge status={status} />
      {showMissing && result.status === "not_measured" && result.missing && <span className="text-sm text-ink-soft">Missing: {result.missing}</span>}
    </span>
  );
}

function DeviationNote({ deviation, current }: { deviation: AcceptedDeviation; current: number | null }) {
  const moved = current !== null && Math.abs(current - deviation.acceptedValue) >= 0.05;
  return (
    <p className="mt-1 text-sm">
      Accepted at <span className="num">{deviation.acceptedValue.toFixed(1)}</span> {deviation.valueUnit} by {deviation.acceptedByName} on{" "}
      <LocalTime iso={deviation.acceptedAt.toISOString()} />: “{deviation.reason}”
      {moved && (
        <strong className="block text-caution">
          The result has changed since: now <span className="num">{current!.toFixed(1)}</span> {deviation.valueUnit}. Review the acceptance.
        </strong>
      )}
    </p>
  );
}

function ConditionsWarning({ messages }: { messages: string[] }) {
  const shown = messages.slice(0, 4);
  return (
    <div className="mt-2 rounded-card border-2 border-caution bg-caution-soft p-2 text-sm">
      <p className="font-semibold">Warning: these readings were not taken under the same recorded operating conditions, so the comparison may not hold.</p>
      <ul className="list-disc pl-5">
        {shown.map((m) => (
          <li key={m}>{m}</li>
        ))}
        {messages.length > shown.length && <li>…and {messages.length - shown.length} more differences.</li>}
      </ul>
    </div>
  );
}

function Tile({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section className="rounded-card border border-line bg-paper p-3" aria-label={title}>
      <h3 className="mb-1 text-base font-semibold">{title}</h3>
      {children}
    </section>
  );
}

function FanTile({ detail, units, result }: { detail: SystemDetail; units: UnitSystem; result: JudgedResult | undefined }) {
  const f = detail.fanResult;
  return (
    <Tile title="Fan, traversed">
      <p className="num">
        Design {formatQuantity(units, "flow", f.designM3S)}
        {f.measuredM3S !== null && (
          <>
            {" "}
            · measured {formatQuantity(units, "flow", f.measuredM3S)} ({pct1(f.pctOfDesign)}, band {formatTolerance(f.tolerance)})
          </>
        )}
      </p>
      {result && <ResultCell result={result} />}
    </Tile>
  );
}

function UnaccountedTile({ detail, units, result }: { detail: SystemDetail; units: UnitSystem; result: JudgedResult | undefined }) {
  const u = detail.unaccounted;
  return (
    <Tile title="Fan against the sum of its outlets">
      {u.status === "complete" ? (
        <div className="space-y-1" data-testid={`unaccounted-${detail.system.tag}`}>
          <p className="num">
            Fan {formatQuantity(units, "flow", u.fanStandardM3S)} − outlets {formatQuantity(units, "flow", u.outletsStandardM3S)} ({u.outlets.length} read)
          </p>
          <p className="num text-lg">
            Unaccounted airflow <strong>{formatQuantity(units, "flow", u.unaccountedStandardM3S)}</strong> ({signedPct(u.unaccountedPct)} of the fan) ±{" "}
            {formatQuantity(units, "flow", u.expandedUncertaintyM3S)} ({formatExpandedUncertainty(u.expandedUncertaintyPct / 100)})
          </p>
          <p className="text-sm text-ink-soft">
            {u.withinUncertainty
              ? "The difference is within the measurements' own uncertainty: it cannot be told apart from measurement error."
              : "The difference is larger than the measurements' uncertainty. It may be duct leakage (only a pressure test measures that), an outlet not scheduled or read, or a reading to repeat."}{" "}
            Combined as the root-sum-square of the traverse&apos;s standard uncertainty and each outlet reading&apos;s (the instrument&apos;s accuracy a as a/√3), expanded with k = 2. Outlets
            read with one hood share its calibration error, which this treats as independent.
          </p>
          {u.initialOnly.length > 0 && <p className="text-sm">Read only as found (initial): {u.initialOnly.join(", ")}.</p>}
          {u.defaultAccuracy.length > 0 && (
            <p className="text-sm">No accuracy in the register for the instrument of {u.defaultAccuracy.join(", ")}: ±5 % of reading assumed (common practice).</p>
          )}
          {u.conditionDifferences.length > 0 && <ConditionsWarning messages={u.conditionDifferences.map((x) => x.message)} />}
          {result && <ResultCell result={result} />}
        </div>
      ) : (
        <div data-testid={`unaccounted-${detail.system.tag}`}>
          <p>{u.message}</p>
          {result && <ResultCell result={result} showMissing={false} />}
        </div>
      )}
    </Tile>
  );
}

function OutsideAirTile({ detail, units, result }: { detail: SystemDetail; units: UnitSystem; result: JudgedResult | undefined }) {
  const oa = detail.outsideAir;
  return (
    <Tile title="Minimum outside air">
      {oa === null ? (
        <p className="text-ink-soft">No minimum outside airflow is scheduled for this system.</p>
      ) : (
        <>
          <p className="num">
            Design {formatQuantity(units, "flow", oa.designM3S)}
            {oa.measuredM3S !== null && (
              <>
                {" "}
                · measured {formatQuantity(units, "flow", oa.measuredM3S)} ({pct1(oa.pctOfDesign)}, band {formatTolerance(oa.tolerance)})
              </>
            )}
          </p>
          <p className="text-sm text-ink-soft">{oa.basis}</p>
          {result && <ResultCell result={result} showMissing={false} />}
        </>
      )}
    </Tile>
  );
}

function Charts({ detail, units, standardDensity }: { detail: SystemDetail; units: UnitSystem; standardDensity: number }) {
  const unit = displayUnit(units, "flow").symbol;
  const bars = detail.terminals.flatMap((t) =>
    t.setpoints.flatMap((sp) => {
      if (sp.pctOfDesign === null) return [];
      return [
        {
          label: t.unit ? `${t.terminal.tag} ${sp.setpoint.slice(0, 3)}` : t.terminal.tag,
          pct: sp.pctOfDesign,
          lowerPct: 100 - sp.band.minusPct,
          upperPct: 100 + sp.band.plusPct,
          outside: sp.within === false,
        },
      ];
    }),
  );
  const junctions = detail.junctions.flatMap((j) =>
    j.status === "checked"
      ? [
          {
            label: j.parent.tag,
            parent: toDisplay(units, "flow", j.junction.parentMassFlowKgS / standardDensity),
            children: toDisplay(units, "flow", j.junction.childrenMassFlowKgS / standardDensity),
          },
        ]
      : [],
  );
  const unread = detail.terminals.flatMap((t) => t.setpoints.filter((sp) => sp.pctOfDesign === null).map(() => t.terminal.tag));
  return (
    <>
      <h3 className="mt-6 mb-2 text-lg font-semibold">% of design per terminal</h3>
      {bars.length === 0 ? (
        <p className="text-ink-soft">No terminal of {detail.system.tag} has been read yet.</p>
      ) : (
        <>
          <TerminalPctChart bars={bars} label={`${detail.system.tag}: % of design per terminal with its band; the table below gives the same values.`} />
          {unread.length > 0 && <p className="text-sm text-ink-soft">Not in the chart (not read): {[...new Set(unread)].join(", ")}.</p>}
          <details className="mt-2">
            <summary className="min-h-touch cursor-pointer py-2 font-semibold">The chart&apos;s values as a table</summary>
            <table className="w-full text-left text-sm">
              <caption className="sr-only">{detail.system.tag}: % of design per terminal</caption>
              <thead>
                <tr>
                  <th scope="col">Terminal</th>
                  <th scope="col" className="text-right">% of design</th>
                  <th scope="col" className="text-right">Band</th>
                  <th scope="col">Result</th>
                </tr>
              </thead>
              <tbody>
                {bars.map((b) => (
                  <tr key={b.label}>
                    <th scope="row" className="font-normal">{b.label}</th>
                    <td className="num text-right">{b.pct.toFixed(1)} %</td>
                    <td className="num text-right">
                      {b.lowerPct.toFixed(0)}–{b.upperPct.toFixed(0)} %
                    </td>
                    <td>{b.outside ? "Outside band" : "Within band"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </details>
        </>
      )}
      <h3 className="mt-6 mb-2 text-lg font-semibold">Junction balance</h3>
      {junctions.length === 0 ? (
        <p className="text-ink-soft">No junction of {detail.system.tag} has its trunk and all its branches traversed yet.</p>
      ) : (
        <>
          <JunctionBalanceChart bars={junctions} unit={unit} label={`${detail.system.tag}: each junction's trunk against the sum of its branches, by mass; the table below gives the same values.`} />
          <details className="mt-2">
            <summary className="min-h-touch cursor-pointer py-2 font-semibold">The chart&apos;s values as a table</summary>
            <table className="w-full text-left text-sm">
              <caption className="sr-only">{detail.system.tag}: junction balance by mass, as standard airflow</caption>
              <thead>
                <tr>
                  <th scope="col">Junction</th>
                  <th scope="col" className="text-right">Trunk ({unit})</th>
                  <th scope="col" className="text-right">Sum of branches ({unit})</th>
                </tr>
              </thead>
              <tbody>
                {junctions.map((b) => (
                  <tr key={b.label}>
                    <th scope="row" className="font-normal">{b.label}</th>
                    <td className="num text-right">{b.parent.toFixed(units === "IP" ? 0 : 3)}</td>
                    <td className="num text-right">{b.children.toFixed(units === "IP" ? 0 : 3)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </details>
        </>
      )}
    </>
  );
}
