"use client";

import { useRouter } from "next/navigation";
import { useMemo, useRef, useState } from "react";
import { ductSize } from "@/components/airflow/format";
import { Button } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/card";
import type { DuctSection } from "@/db/schema";
import { ApiError } from "@/lib/api-client";
import { designApi } from "@/lib/api-client/design";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import type { TerminalResource } from "@/lib/design/resources";
import { designSchemas, isTerminalUnit, SERVICE_LABELS, TERMINAL_KIND_LABELS, type TerminalKind } from "@/lib/validation/design";
import { DesignForm } from "./design-form";
import { FormMessage } from "./form-fields";
import { sectionFields, sectionInitial, terminalFields, terminalInitial } from "./specs";

type Mode =
  | { kind: "view" }
  | { kind: "addTrunk" }
  | { kind: "addBranch" }
  | { kind: "editSection" }
  | { kind: "confirmSection" }
  | { kind: "addTerminal"; terminalKind: TerminalKind }
  | { kind: "editTerminal"; id: string }
  | { kind: "confirmTerminal"; id: string };

interface Props {
  projectId: string;
  units: "IP" | "SI";
  system: { id: string; tag: string; kind: "supply" | "return" | "exhaust" | "outside_air"; designFlowM3S: number };
  sections: DuctSection[];
  terminals: TerminalResource[];
  traversesBySection: Record<string, number>;
  readingsByTerminal: Record<string, number>;
}

/** Design sums that disagree by more than this are pointed out (a schedule check, common practice). */
const SUM_TOLERANCE = 0.02;

/** The system's duct tree with everything on it, and the forms to add, edit, move and delete. */
export function DuctTreeEditor({ projectId, units: unitSystem, system, sections, terminals, traversesBySection, readingsByTerminal }: Props) {
  const router = useRouter();
  const units = FORM_UNITS[unitSystem];
  const flow = (v: number) => formatIn(units.flow, v, 4);
  const [selectedId, setSelectedId] = useState<string | null>(() => sections.find((s) => s.parentId === null)?.id ?? null);
  const [mode, setMode] = useState<Mode>({ kind: "view" });
  const [message, setMessage] = useState<{ text: string; tone: "ok" | "fault" } | null>(null);
  const [busy, setBusy] = useState(false);
  const panel = useRef<HTMLDivElement>(null);

  const children = useMemo(() => {
    const map = new Map<string | null, DuctSection[]>();
    for (const s of [...sections].sort((a, b) => a.tag.localeCompare(b.tag, "en", { numeric: true }))) map.set(s.parentId, [...(map.get(s.parentId) ?? []), s]);
    return map;
  }, [sections]);
  const terminalsOf = (id: string) => terminals.filter((t) => t.sectionId === id).sort((a, b) => a.tag.localeCompare(b.tag, "en", { numeric: true }));
  const byId = new Map(sections.map((s) => [s.id, s]));
  const selected = selectedId ? byId.get(selectedId) ?? null : null;

  const subtree = (id: string): string[] => [id, ...(children.get(id) ?? []).flatMap((c) => subtree(c.id))];
  const sectionOptions = (exclude: string[] = []) => {
    const out: { value: string; label: string }[] = [];
    const walk = (parent: string | null, depth: number) => {
      for (const s of children.get(parent) ?? []) {
        if (exclude.includes(s.id)) continue;
        // Options cannot hold markup: non-breaking spaces and a corner show the depth.
        out.push({ value: s.id, label: `${"\u00a0\u00a0\u00a0".repeat(depth)}${depth > 0 ? "└ " : ""}${s.tag} · ${ductSize(s, unitSystem)}` });
        walk(s.id, depth + 1);
      }
    };
    walk(null, 0);
    return out;
  };

  function select(id: string) {
    setSelectedId(id);
    setMode({ kind: "view" });
    setMessage(null);
    // On narrow screens the panel sits below the tree: bring it into view.
    requestAnimationFrame(() => panel.current?.scrollIntoView({ block: "nearest", behavior: "smooth" }));
  }

  function saved(text: string, nextSelected?: string) {
    setMode({ kind: "view" });
    setMessage({ text, tone: "ok" });
    if (nextSelected) setSelectedId(nextSelected);
    router.refresh();
  }

  async function remove(what: "section" | "terminal", id: string) {
    setBusy(true);
    setMessage(null);
    try {
      const res = what === "section" ? await designApi.deleteSection(projectId, id) : await designApi.deleteTerminal(projectId, id);
      const d = res.deleted;
      if (what === "section") setSelectedId(selected?.parentId ?? null);
      saved(`Deleted ${[...d.sections, ...d.terminals].join(", ")}.`);
    } catch (err) {
      setMode({ kind: "view" });
      setMessage({ text: err instanceof ApiError ? err.message : "Deleting failed; nothing was changed.", tone: "fault" });
    } finally {
      setBusy(false);
    }
  }

  /** Where a section's design disagrees with what hangs below it. */
  function sumNote(s: DuctSection): string | null {
    const kids = children.get(s.id) ?? [];
    const notes: string[] = [];
    if (kids.length > 0) {
      const total = kids.reduce((a, k) => a + k.designFlowM3S, 0);
      if (Math.abs(total - s.designFlowM3S) > SUM_TOLERANCE * s.designFlowM3S)
        notes.push(`Branches add up to ${flow(total)}, ${Math.abs(Math.round((100 * (total - s.designFlowM3S)) / s.designFlowM3S))} % ${total > s.designFlowM3S ? "above" : "below"} ${s.tag}'s ${flow(s.designFlowM3S)}.`);
    }
    const own = terminalsOf(s.id);
    if (own.length > 0 && kids.length === 0) {
      const total = own.reduce((a, t) => a + t.designFlowM3S, 0);
      if (Math.abs(total - s.designFlowM3S) > SUM_TOLERANCE * s.designFlowM3S)
        notes.push(`Its terminals add up to ${flow(total)}, ${Math.abs(Math.round((100 * (total - s.designFlowM3S)) / s.designFlowM3S))} % ${total > s.designFlowM3S ? "above" : "below"} ${flow(s.designFlowM3S)}.`);
    }
    return notes.length ? notes.join(" ") : null;
  }

  const renderNode = (s: DuctSection) => {
    const kids = children.get(s.id) ?? [];
    const own = terminalsOf(s.id);
    const outlets = own.filter((t) => !isTerminalUnit(t.kind)).length;
    const boxes = own.length - outlets;
    const traverses = traversesBySection[s.id] ?? 0;
    const note = sumNote(s);
    const isSelected = s.id === selectedId;
    return (
      <li key={s.id}>
        <div className={`my-1 flex flex-wrap items-center gap-x-3 gap-y-1 rounded-card border-2 px-2 py-1 ${isSelected ? "border-accent bg-accent-soft" : "border-transparent hover:border-line"}`}>
          <button
            type="button"
            onClick={() => select(s.id)}
            aria-pressed={isSelected}
            aria-label={`${s.tag}, ${s.parentId ? "branch" : "trunk"}: open`}
            className="min-h-touch min-w-touch rounded-card px-2 text-left text-lg font-semibold text-accent-strong underline-offset-4 hover:underline"
          >
            {s.tag}
          </button>
          <span className="text-sm text-ink-muted">{s.parentId ? "branch" : "trunk"}</span>
          <span className="num">{ductSize(s, unitSystem)}</span>
          <span className="num font-semibold">{flow(s.designFlowM3S)}</span>
          <span className="text-sm text-ink-soft">
            {outlets > 0 && `${outlets} outlet${outlets === 1 ? "" : "s"}`}
            {outlets > 0 && boxes > 0 && " · "}
            {boxes > 0 && `${boxes} terminal unit${boxes === 1 ? "" : "s"}`}
          </span>
          <span className="text-sm text-ink-muted">{traverses > 0 ? `${traverses} traverse${traverses === 1 ? "" : "s"}` : "no traverse yet"}</span>
          {note && (
            <span className="flex w-full items-start gap-1 text-sm font-semibold text-caution">
              <svg viewBox="0 0 16 16" width="16" height="16" aria-hidden="true" className="mt-0.5 shrink-0">
                <path d="M8 1.5L15 14H1L8 1.5z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
                <path d="M8 6v4M8 11.8v.4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
              </svg>
              Check the schedule: {note}
            </span>
          )}
        </div>
        {kids.length > 0 && <ul className="ml-4 border-l-2 border-line-strong pl-4">{kids.map(renderNode)}</ul>}
      </li>
    );
  };

  const roots = children.get(null) ?? [];
  const serviceDefault = system.kind;

  return (
    <div className="grid items-start gap-gutter xl:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
      <section aria-labelledby="tree-title" className="rounded-card border border-line bg-paper-raised p-gutter shadow-sm">
        <header className="mb-3 flex flex-wrap items-center justify-between gap-3">
          <h2 id="tree-title">Duct tree of {system.tag}</h2>
          <Button variant="secondary" onClick={() => { setMode({ kind: "addTrunk" }); setMessage(null); }}>
            Add trunk
          </Button>
        </header>
        <p className="num mb-2 text-sm text-ink-soft">
          Fan design airflow {flow(system.designFlowM3S)}. Select a section to see its outlets and terminal units, edit it, move it or add branches below it.
        </p>
        {roots.length === 0 ? (
          <EmptyState>
            No duct sections in {system.tag} yet. Add the trunk that leaves the fan, then its branches, or import a design schedule from the Set-up screen.
          </EmptyState>
        ) : (
          <ul aria-label={`Duct tree of ${system.tag}`}>{roots.map(renderNode)}</ul>
        )}
      </section>

      <div ref={panel} className="scroll-mt-4 space-y-3">
        {/* The live region stays in the page so that its messages are announced; it takes no room while empty. */}
        <div className={message ? "" : "-mb-3"}>
          <FormMessage message={message?.text ?? null} tone={message?.tone ?? "ok"} />
        </div>
        {mode.kind === "addTrunk" && (
          <section aria-labelledby="add-trunk" className="rounded-card border-2 border-accent bg-paper-raised p-gutter">
            <h2 id="add-trunk" className="mb-3">New trunk of {system.tag}</h2>
            <DesignForm
              idPrefix="new-trunk"
              title="New trunk"
              fields={sectionFields(sectionOptions())}
              initial={sectionInitial(null, units, null)}
              units={units}
              fixed={{ systemId: system.id }}
              schema={designSchemas(units).section}
              mode="create"
              columns={2}
              submitLabel="Add section"
              save={(p) => designApi.createSection(projectId, p)}
              onSaved={(r) => saved("Section added.", (r as { section: { id: string } }).section.id)}
              onCancel={() => setMode({ kind: "view" })}
            />
          </section>
        )}
        {selected && mode.kind !== "addTrunk" && (
          <SectionPanel
            key={selected.id}
            {...{ projectId, unitSystem, selected, mode, setMode, busy, remove, saved, sectionOptions, subtree, serviceDefault, traversesBySection, readingsByTerminal }}
            parent={selected.parentId ? byId.get(selected.parentId) ?? null : null}
            kids={children.get(selected.id) ?? []}
            own={terminalsOf(selected.id)}
            systemId={system.id}
          />
        )}
        {!selected && mode.kind !== "addTrunk" && roots.length > 0 && <EmptyState>Select a section in the tree to see and edit it.</EmptyState>}
      </div>
    </div>
  );
}

interface PanelProps {
  projectId: string;
  unitSystem: "IP" | "SI";
  systemId: string;
  selected: DuctSection;
  parent: DuctSection | null;
  kids: DuctSection[];
  own: TerminalResource[];
  mode: Mode;
  setMode: (m: Mode) => void;
  busy: boolean;
  remove: (what: "section" | "terminal", id: string) => void;
  saved: (text: string, next?: string) => void;
  sectionOptions: (exclude?: string[]) => { value: string; label: string }[];
  subtree: (id: string) => string[];
  serviceDefault: string;
  traversesBySection: Record<string, number>;
  readingsByTerminal: Record<string, number>;
}

function SectionPanel({ projectId, unitSystem, systemId, selected, parent, kids, own, mode, setMode, busy, remove, saved, sectionOptions, subtree, serviceDefault, traversesBySection, readingsByTerminal }: PanelProps) {
  const units = FORM_UNITS[unitSystem];
  const flow = (v: number | null) => (v === null ? "—" : formatIn(units.flow, v, 4));
  const run = (mm: number | null) => (mm === null ? "not given" : formatIn(units.run, mm, 3));
  const outlets = own.filter((t) => !isTerminalUnit(t.kind));
  const boxes = own.filter((t) => isTerminalUnit(t.kind));
  const traverses = traversesBySection[selected.id] ?? 0;
  const below = subtree(selected.id).length - 1;
  const neck = (t: TerminalResource) => (t.sizeShape ? ductSize({ shape: t.sizeShape, diameterMm: t.diameterMm, widthMm: t.widthMm, heightMm: t.heightMm }, unitSystem) : "—");
  const editing = mode.kind === "editTerminal" ? own.find((t) => t.id === mode.id) ?? null : null;
  const sectionsForTerminals = sectionOptions();

  const terminalActions = (t: TerminalResource) =>
    mode.kind === "confirmTerminal" && mode.id === t.id ? (
      <span role="group" aria-label={`Confirm deleting ${t.tag}`} className="flex flex-wrap gap-2">
        <Button onClick={() => remove("terminal", t.id)} disabled={busy} className="bg-fault hover:bg-fault">
          Delete {t.tag}
        </Button>
        <Button variant="secondary" onClick={() => setMode({ kind: "view" })}>
          Keep
        </Button>
      </span>
    ) : (
      <span className="flex gap-1">
        <Button variant="quiet" onClick={() => setMode({ kind: "editTerminal", id: t.id })} aria-label={`Edit ${t.tag}`}>
          Edit
        </Button>
        <Button variant="quiet" onClick={() => setMode({ kind: "confirmTerminal", id: t.id })} aria-label={`Delete ${t.tag}`}>
          Delete
        </Button>
      </span>
    );

  return (
    <section aria-labelledby="section-title" className="rounded-card border border-line bg-paper-raised p-gutter shadow-sm">
      <header className="mb-3">
        <h2 id="section-title">
          {selected.tag} <span className="font-normal text-ink-soft">· {parent ? `branch of ${parent.tag}` : "trunk leaving the fan"}</span>
        </h2>
      </header>

      {mode.kind === "editSection" ? (
        <DesignForm
          idPrefix="section"
          title={`Edit ${selected.tag}`}
          fields={sectionFields(sectionOptions(subtree(selected.id)))}
          initial={sectionInitial(selected, units, null)}
          units={units}
          fixed={{ systemId }}
          schema={designSchemas(units).section}
          mode="edit"
          columns={2}
          submitLabel="Save section"
          save={(p) => designApi.updateSection(projectId, selected.id, p)}
          onSaved={() => saved(`${selected.tag} saved.`)}
          onCancel={() => setMode({ kind: "view" })}
        />
      ) : (
        <>
          <dl className="num grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
            <dt className="text-ink-muted">Inside size</dt>
            <dd>{ductSize(selected, unitSystem)}</dd>
            <dt className="text-ink-muted">Design airflow</dt>
            <dd className="font-semibold">{flow(selected.designFlowM3S)}</dd>
            <dt className="text-ink-muted">Straight duct</dt>
            <dd>
              {run(selected.straightUpstreamMm)} upstream · {run(selected.straightDownstreamMm)} downstream
            </dd>
            <dt className="text-ink-muted">Location</dt>
            <dd>{selected.location || "not given"}</dd>
            <dt className="text-ink-muted">Traverses</dt>
            <dd>{traverses > 0 ? `${traverses} recorded` : "No traverse yet: a technician starts one from Field work."}</dd>
          </dl>
          {kids.length === 0 && (
            <p className="mt-3 rounded-card border border-dashed border-line-strong bg-paper p-3 text-ink-soft">
              No branches below {selected.tag} yet, so there is no junction to check here. Add a branch if the duct divides at {selected.tag}.
            </p>
          )}
          <div className="mt-3 flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => setMode({ kind: "editSection" })}>
              Edit or move
            </Button>
            <Button variant="secondary" onClick={() => setMode({ kind: "addBranch" })}>
              Add branch below
            </Button>
            {mode.kind === "confirmSection" ? (
              <span role="group" aria-label="Confirm delete" className="flex flex-wrap items-center gap-2 rounded-card border-2 border-fault bg-fault-soft px-2 py-1">
                <span className="font-semibold text-fault">
                  Delete {selected.tag}
                  {below > 0 && `, the ${below} section${below === 1 ? "" : "s"} below it`} and their terminals?
                </span>
                <Button onClick={() => remove("section", selected.id)} disabled={busy} className="bg-fault hover:bg-fault">
                  Delete
                </Button>
                <Button variant="secondary" onClick={() => setMode({ kind: "view" })}>
                  Keep
                </Button>
              </span>
            ) : (
              <Button variant="quiet" onClick={() => setMode({ kind: "confirmSection" })}>
                Delete section…
              </Button>
            )}
          </div>
        </>
      )}

      {mode.kind === "addBranch" && (
        <div className="mt-4 rounded-card border-2 border-accent bg-paper p-4">
          <h3 className="mb-3 text-lg font-semibold">New branch below {selected.tag}</h3>
          <DesignForm
            idPrefix="new-branch"
            title={`New branch below ${selected.tag}`}
            fields={sectionFields(sectionOptions())}
            initial={sectionInitial(null, units, selected.id)}
            units={units}
            fixed={{ systemId }}
            schema={designSchemas(units).section}
            mode="create"
            columns={2}
            submitLabel="Add branch"
            save={(p) => designApi.createSection(projectId, p)}
            onSaved={(r) => saved("Branch added.", (r as { section: { id: string } }).section.id)}
            onCancel={() => setMode({ kind: "view" })}
          />
        </div>
      )}

      {own.length === 0 ? (
        <>
          <h3 className="mt-5 mb-2 text-lg font-semibold">Outlets and terminal units on {selected.tag}</h3>
          <p className="rounded-card border border-dashed border-line-strong bg-paper p-3 text-ink-soft">
            No outlets or terminal units on {selected.tag} yet. Add them here, or import them with the design schedule.
          </p>
        </>
      ) : (
        <>
      <h3 className="mt-5 mb-2 text-lg font-semibold">Outlets and inlets on {selected.tag}</h3>
      {outlets.length === 0 ? (
        <p className="text-ink-soft">None yet.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full whitespace-nowrap text-left">
            <thead className="border-b-2 border-line text-sm text-ink-muted">
              <tr>
                <th className="py-2 pr-3">Tag</th>
                <th className="py-2 pr-3">Kind</th>
                <th className="py-2 pr-3">Room</th>
                <th className="py-2 pr-3">Neck</th>
                <th className="py-2 pr-3 text-right">Design ({units.flow.symbol})</th>
                <th className="py-2 pr-3 text-right">Ak ({units.area.symbol})</th>
                <th className="py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {outlets.map((t) => (
                <tr key={t.id} className="border-b border-line">
                  <td className="py-1 pr-3 font-semibold">{t.tag}</td>
                  <td className="py-1 pr-3">{TERMINAL_KIND_LABELS[t.kind]}{t.service !== "supply" && <span className="text-sm text-ink-muted"> · {SERVICE_LABELS[t.service]}</span>}</td>
                  <td className="py-1 pr-3">{t.room || "—"}</td>
                  <td className="py-1 pr-3">{neck(t)}</td>
                  <td className="py-1 pr-3 text-right">{formatIn(units.flow, t.designFlowM3S, 4).replace(` ${units.flow.symbol}`, "")}</td>
                  <td className="py-1 pr-3 text-right">{t.effectiveAreaM2 === null ? "—" : formatIn(units.area, t.effectiveAreaM2, 3).replace(` ${units.area.symbol}`, "")}</td>
                  <td className="py-1">{(readingsByTerminal[t.id] ?? 0) > 0 ? <span className="text-sm text-ink-muted">{readingsByTerminal[t.id]} readings</span> : null} {terminalActions(t)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}

      <h3 className="mt-5 mb-2 text-lg font-semibold">Terminal units on {selected.tag}</h3>
      {boxes.length === 0 ? (
        <p className="text-ink-soft">None yet.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full whitespace-nowrap text-left">
            <thead className="border-b-2 border-line text-sm text-ink-muted">
              <tr>
                <th className="py-2 pr-3">Tag</th>
                <th className="py-2 pr-3">Kind</th>
                <th className="py-2 pr-3">Inlet</th>
                <th className="py-2 pr-3 text-right">Max ({units.flow.symbol})</th>
                <th className="py-2 pr-3 text-right">Min</th>
                <th className="py-2 pr-3 text-right">Heating</th>
                <th className="py-2 pr-3 text-right">Flow factor</th>
                <th className="py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {boxes.map((t) => (
                <tr key={t.id} className="border-b border-line">
                  <td className="py-1 pr-3 font-semibold">{t.tag}</td>
                  <td className="py-1 pr-3">{TERMINAL_KIND_LABELS[t.kind]}</td>
                  <td className="py-1 pr-3">{neck(t)}</td>
                  <td className="py-1 pr-3 text-right">{flow(t.designFlowM3S).replace(` ${units.flow.symbol}`, "")}</td>
                  <td className="py-1 pr-3 text-right">{flow(t.designMinFlowM3S).replace(` ${units.flow.symbol}`, "")}</td>
                  <td className="py-1 pr-3 text-right">{flow(t.designHeatingFlowM3S).replace(` ${units.flow.symbol}`, "")}</td>
                  <td className="py-1 pr-3 text-right">{t.controllerFlowFactor ?? "—"}</td>
                  <td className="py-1">{terminalActions(t)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
        </>
      )}
      {mode.kind !== "addTerminal" && mode.kind !== "editTerminal" && (
        <div className="mt-3 flex flex-wrap gap-2">
          <Button variant="secondary" onClick={() => setMode({ kind: "addTerminal", terminalKind: "diffuser" })}>
            Add outlet or inlet
          </Button>
          <Button variant="secondary" onClick={() => setMode({ kind: "addTerminal", terminalKind: "vav_box" })}>
            Add terminal unit
          </Button>
        </div>
      )}
      {(mode.kind === "addTerminal" || editing) && (
        <div className="mt-4 rounded-card border-2 border-accent bg-paper p-4">
          <h3 className="mb-3 text-lg font-semibold">{editing ? `Edit ${editing.tag}` : mode.kind === "addTerminal" && isTerminalUnit(mode.terminalKind) ? `New terminal unit on ${selected.tag}` : `New outlet or inlet on ${selected.tag}`}</h3>
          <DesignForm
            key={editing?.id ?? `new-${mode.kind === "addTerminal" ? mode.terminalKind : ""}`}
            idPrefix={editing ? "terminal" : "new-terminal"}
            title={editing ? `Edit ${editing.tag}` : "New terminal"}
            fields={terminalFields(sectionsForTerminals)}
            initial={terminalInitial(editing, units, selected.id, serviceDefault, mode.kind === "addTerminal" ? mode.terminalKind : undefined)}
            units={units}
            schema={designSchemas(units).terminal}
            mode={editing ? "edit" : "create"}
            columns={2}
            submitLabel={editing ? "Save terminal" : "Add terminal"}
            save={(p) => (editing ? designApi.updateTerminal(projectId, editing.id, p) : designApi.createTerminal(projectId, p))}
            onSaved={() => saved(editing ? `${editing.tag} saved.` : "Terminal added.")}
            onCancel={() => setMode({ kind: "view" })}
          />
        </div>
      )}
    </section>
  );
}
