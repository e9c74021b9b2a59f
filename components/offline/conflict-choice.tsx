"use client";

/**
 * The choice after a version conflict: both versions side by side, each rendered by the screen that
 * owns the data, and two large buttons. Nothing is overwritten until the technician picks one.
 */
import { useId } from "react";
import type { DraftConflict } from "@/lib/offline/use-offline-draft";

export interface ConflictChoiceProps<T> {
  conflict: DraftConflict<T>;
  /** Shows one version (a grid, a summary line…). */
  render: (value: T, side: "mine" | "theirs") => React.ReactNode;
  onChoose: (choice: "mine" | "theirs") => void;
  /** What the resource is, for the heading: "readings of S1.2". */
  what: string;
}

export function ConflictChoice<T>({ conflict, render, onChoose, what }: ConflictChoiceProps<T>) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="rounded-card border-2 border-fault bg-fault-soft p-4">
      <h2 id={id} className="text-lg">
        Two versions of the {what}
      </h2>
      <p className="mb-3 text-sm">{conflict.message} Nothing has been overwritten. Compare them and choose which one the server keeps.</p>
      <div className="grid gap-3 md:grid-cols-2">
        <div className="rounded-card border border-line-strong bg-paper-raised p-3">
          <h3 className="mb-2 font-semibold">On this device (yours)</h3>
          {render(conflict.mine, "mine")}
          <button type="button" onClick={() => onChoose("mine")} className="mt-3 inline-flex min-h-touch w-full items-center justify-center rounded-card bg-accent px-4 font-semibold text-white">
            Keep mine
          </button>
        </div>
        <div className="rounded-card border border-line-strong bg-paper-raised p-3">
          <h3 className="mb-2 font-semibold">On the server{conflict.theirsVersion !== null ? ` (version ${conflict.theirsVersion})` : ""}</h3>
          {render(conflict.theirs, "theirs")}
          <button type="button" onClick={() => onChoose("theirs")} className="mt-3 inline-flex min-h-touch w-full items-center justify-center rounded-card border-2 border-accent bg-paper-raised px-4 font-semibold text-accent-strong">
            Take the server&apos;s
          </button>
        </div>
      </div>
    </section>
  );
}
