"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { AirSystem } from "@/db/schema";
import { ApiError } from "@/lib/api-client";
import { designApi } from "@/lib/api-client/design";
import { FORM_UNITS } from "@/lib/design/quantities";
import { designSchemas } from "@/lib/validation/design";
import { DesignForm } from "./design-form";
import { FormMessage } from "./form-fields";
import { systemFields, systemInitial } from "./specs";

/** "Add air system" on the set-up screen: a button that opens the form. */
export function AddSystem({ projectId, units: unitSystem, emphasise }: { projectId: string; units: "IP" | "SI"; emphasise?: boolean }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const units = FORM_UNITS[unitSystem];
  if (!open)
    return (
      <Button variant={emphasise ? "primary" : "secondary"} onClick={() => setOpen(true)}>
        Add air system
      </Button>
    );
  return (
    <div className="w-full rounded-card border-2 border-accent bg-paper p-4">
      <h3 className="mb-3 text-lg font-semibold">New air system</h3>
      <DesignForm
        idPrefix="new-system"
        title="New air system"
        fields={systemFields()}
        initial={systemInitial(null, units)}
        units={units}
        schema={designSchemas(units).system}
        mode="create"
        columns={4}
        submitLabel="Add system"
        save={(payload) => designApi.createSystem(projectId, payload)}
        onSaved={(result) => {
          const { system } = result as { system: { id: string } };
          router.push(`/projects/${projectId}/setup/systems/${system.id}`);
          router.refresh();
        }}
        onCancel={() => setOpen(false)}
      />
    </div>
  );
}

/** Edit or delete a system (the delete is refused while field data hangs on it). */
export function SystemActions({ projectId, system, units: unitSystem, sectionCount, terminalCount }: { projectId: string; system: AirSystem; units: "IP" | "SI"; sectionCount: number; terminalCount: number }) {
  const router = useRouter();
  const units = FORM_UNITS[unitSystem];
  const [mode, setMode] = useState<"view" | "edit" | "confirm">("view");
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function remove() {
    setBusy(true);
    setMessage(null);
    try {
      await designApi.deleteSystem(projectId, system.id);
      router.push(`/projects/${projectId}/setup`);
      router.refresh();
    } catch (err) {
      setMessage(err instanceof ApiError ? err.message : "The system could not be deleted.");
      setMode("view");
    } finally {
      setBusy(false);
    }
  }

  if (mode === "edit")
    return (
      <DesignForm
        idPrefix="system"
        title={`Edit ${system.tag}`}
        fields={systemFields()}
        initial={systemInitial(system, units)}
        units={units}
        schema={designSchemas(units).system}
        mode="edit"
        columns={4}
        submitLabel="Save system"
        save={(payload) => designApi.updateSystem(projectId, system.id, payload)}
        onSaved={() => {
          setMode("view");
          router.refresh();
        }}
        onCancel={() => setMode("view")}
      />
    );
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap gap-3">
        <Button variant="secondary" onClick={() => setMode("edit")}>
          Edit system
        </Button>
        {mode === "confirm" ? (
          <div role="group" aria-label="Confirm delete" className="flex flex-wrap items-center gap-3 rounded-card border-2 border-fault bg-fault-soft px-3 py-1">
            <span className="font-semibold text-fault">
              Delete {system.tag} with its {sectionCount} duct section{sectionCount === 1 ? "" : "s"} and {terminalCount} terminal{terminalCount === 1 ? "" : "s"}?
            </span>
            <Button onClick={remove} disabled={busy} className="bg-fault hover:bg-fault">
              Delete
            </Button>
            <Button variant="secondary" onClick={() => setMode("view")}>
              Keep it
            </Button>
          </div>
        ) : (
          <Button variant="quiet" onClick={() => setMode("confirm")}>
            Delete system…
          </Button>
        )}
      </div>
      <FormMessage message={message} tone="fault" />
    </div>
  );
}
