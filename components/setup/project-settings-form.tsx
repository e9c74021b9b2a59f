"use client";

import { useRouter } from "next/navigation";
import { useMemo, useRef, useState } from "react";
import type { Project } from "@/db/schema";
import { designApi } from "@/lib/api-client/design";
import { FORM_UNITS } from "@/lib/design/quantities";
import { designSchemas } from "@/lib/validation/design";
import { DesignForm } from "./design-form";
import { projectFields, projectInitial } from "./specs";
import type { FormValues } from "./use-design-form";

/** A new project. Its values are typed in the user's units, or in the units chosen for the project when the user has no preference. */
export function NewProjectForm({ userUnits }: { userUnits: "IP" | "SI" | null }) {
  const router = useRouter();
  const [projectUnits, setProjectUnits] = useState<"IP" | "SI">(userUnits ?? "IP");
  const typing = userUnits ?? projectUnits;
  const units = FORM_UNITS[typing];
  const latest = useRef<FormValues | null>(null);
  const fields = useMemo(() => projectFields().filter((f) => f.name !== "unitSystem"), []);
  const [seed, setSeed] = useState<FormValues>(() => projectInitial(null, FORM_UNITS[userUnits ?? "IP"], userUnits ?? "IP"));

  function choose(u: "IP" | "SI") {
    const fresh = projectInitial(null, FORM_UNITS[userUnits ?? u], u);
    // Keep what was typed; the altitude and standard air start again in the newly chosen units.
    setSeed(latest.current ? { ...latest.current, altitudeM: fresh.altitudeM!, standardDensityKgM3: fresh.standardDensityKgM3! } : fresh);
    setProjectUnits(u);
  }

  return (
    <div className="space-y-4">
      <fieldset className="rounded-card border border-line p-3">
        <legend className="px-1 font-semibold text-ink-soft">Unit system of the project</legend>
        <div className="flex flex-wrap gap-4">
          {(["IP", "SI"] as const).map((u) => (
            <label key={u} className="flex min-h-touch cursor-pointer items-center gap-2 font-semibold">
              <input type="radio" name="project-units" value={u} checked={projectUnits === u} onChange={() => choose(u)} className="h-5 w-5 accent-accent" />
              {u === "IP" ? "Inch-pound (cfm, in., in. w.c., °F)" : "SI (L/s, mm, Pa, °C)"}
            </label>
          ))}
        </div>
        <p className="mt-1 text-sm text-ink-muted">
          {userUnits
            ? `You type in ${userUnits === "IP" ? "inch-pound" : "SI"} units (your own setting in the header); everyone without a setting sees the project's units.`
            : "The values below are typed in the project's units."}
        </p>
      </fieldset>
      <DesignForm
        key={projectUnits}
        idPrefix="new-project"
        title="New project"
        fields={fields}
        initial={seed}
        units={units}
        fixed={{ unitSystem: projectUnits }}
        schema={designSchemas(units).project}
        mode="create"
        columns={2}
        submitLabel="Create project"
        onValuesChange={(v) => {
          latest.current = v;
        }}
        save={(payload) => designApi.createProject(payload)}
        onSaved={(result) => {
          const { project } = result as { project: { id: string } };
          router.push(`/projects/${project.id}/setup`);
          router.refresh();
        }}
        onCancel={() => router.push("/projects")}
      />
    </div>
  );
}

/** The project's settings, typed in the viewer's units. */
export function EditProjectForm({ project, units: unitSystem, onDone }: { project: Project; units: "IP" | "SI"; onDone: () => void }) {
  const router = useRouter();
  const units = FORM_UNITS[unitSystem];
  return (
    <DesignForm
      idPrefix="project"
      title="Project settings"
      fields={projectFields()}
      initial={projectInitial(project, units, project.unitSystem)}
      units={units}
      schema={designSchemas(units).project}
      mode="edit"
      columns={2}
      submitLabel="Save settings"
      save={(payload) => designApi.updateProject(project.id, payload)}
      onSaved={() => {
        onDone();
        router.refresh();
      }}
      onCancel={onDone}
    />
  );
}
