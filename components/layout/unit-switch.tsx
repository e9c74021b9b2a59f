"use client";

import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { api } from "@/lib/api-client";

type Choice = "IP" | "SI" | null;
const CHOICES: { value: Choice; label: string; title: string }[] = [
  { value: null, label: "Project", title: "Show each project in its own unit system" },
  { value: "SI", label: "SI", title: "L/s, Pa, m/s, °C, mm" },
  { value: "IP", label: "IP", title: "cfm, in. w.c., fpm, °F, in" },
];

/** The user's unit system: pages render on the server, so a change refreshes them. */
export function UnitSwitch({ current }: { current: Choice }) {
  const router = useRouter();
  const mutation = useMutation({
    mutationFn: (unitSystem: Choice) => api.updatePreferences({ unit_system: unitSystem }),
    onSuccess: () => router.refresh(),
  });
  const shown = mutation.isPending ? mutation.variables : current;
  return (
    <div className="flex items-center gap-2">
      <fieldset className="flex overflow-hidden rounded-card border border-ink-muted" aria-label="Units" disabled={mutation.isPending}>
        <legend className="sr-only">Units</legend>
        {CHOICES.map((c) => (
          <label
            key={c.label}
            title={c.title}
            className={`flex min-h-touch cursor-pointer items-center px-3 text-sm font-semibold ${shown === c.value ? "bg-paper text-ink" : "text-paper-sunk hover:bg-ink-soft"}`}
          >
            <input
              type="radio"
              name="unit-system"
              className="sr-only"
              checked={shown === c.value}
              onChange={() => mutation.mutate(c.value)}
            />
            {c.label}
          </label>
        ))}
      </fieldset>
      {mutation.isError && (
        <span role="alert" className="text-sm font-semibold text-caution-soft">
          {mutation.error.message}
        </span>
      )}
    </div>
  );
}
