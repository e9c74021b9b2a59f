"use client";

/**
 * A version conflict on the traverse grid: both grids side by side, compact, and the choice. Drawn only
 * when a conflict is there, so it comes after the page (later-parts.ts) and is kept on the device.
 */
import { ConflictChoice } from "@/components/offline/conflict-choice";
import type { TraverseDraft } from "@/lib/api-client/traverses";
import type { DraftConflict } from "@/lib/offline/use-offline-draft";
import type { Grid, PointRef } from "@/lib/traverse/engine-input";
import type { UnitSystem } from "@/lib/units";
import { readingText } from "./reading-grid";

export function GridConflict({
  conflict,
  what,
  onChoose,
  quantity,
  units,
  round,
}: {
  conflict: DraftConflict<TraverseDraft>;
  what: string;
  onChoose: (choice: "mine" | "theirs") => void;
  quantity: "pressure" | "velocity";
  units: UnitSystem;
  round: boolean;
}) {
  return <ConflictChoice conflict={conflict} what={what} onChoose={onChoose} render={(d) => <GridSummary readings={d.readings} unreadable={d.unreadable} quantity={quantity} units={units} round={round} />} />;
}

/** One version of the grid, compact, for the conflict choice. */
function GridSummary({ readings, unreadable, quantity, units, round }: { readings: Grid; unreadable: readonly PointRef[]; quantity: "pressure" | "velocity"; units: UnitSystem; round: boolean }) {
  const blocked = new Set(unreadable.map(([k, i]) => `${k}:${i}`));
  return (
    <div className="overflow-x-auto">
      <table className="border-collapse text-right text-sm">
        <caption className="sr-only">Readings by {round ? "diameter" : "line"} and point</caption>
        <tbody>
          {readings.map((row, k) => (
            <tr key={k} className="border-t border-line">
              <th scope="row" className="px-1 text-left">
                {k + 1}
              </th>
              {row.map((v, i) => (
                <td key={i} className="num px-1">
                  {blocked.has(`${k}:${i}`) ? "×" : v === null ? "–" : readingText(v, quantity, units)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
