/**
 * The proportional-balancing plan for one branch's outlets from their latest readings (common
 * practice): the index outlet (lowest measured ÷ design) stays open as the reference, the others are
 * throttled to its ratio in the order given. Said plainly when the readings were taken under
 * different operating conditions, when some outlets are not read yet, and when one cannot be used.
 */
import { BALANCING_ROLES } from "@/components/airflow/balancing-aids";
import { proportionalBalance, type Tolerance } from "@/lib/airflow/balancing";
import { compareConditionsAcross, type ConditionsLike } from "@/lib/airflow/conditions";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import type { ReadingView } from "./model";

export interface BalancingOutlet {
  tag: string;
  designFlowM3S: number;
  reading: ReadingView | null;
}

export function OutletBalancing({
  branchTag,
  outlets,
  tolerance,
  units,
  conditionsOf,
}: {
  branchTag: string;
  outlets: BalancingOutlet[];
  tolerance: Tolerance;
  units: UnitSystem;
  conditionsOf: (id: string | null) => ConditionsLike | null;
}) {
  const usable = outlets.filter((o): o is BalancingOutlet & { reading: ReadingView } => o.reading !== null && Number.isFinite(o.reading.standardFlowM3S) && o.reading.standardFlowM3S >= 0);
  const unread = outlets.filter((o) => o.reading === null).map((o) => o.tag);
  const unusable = outlets.filter((o) => o.reading !== null && !(Number.isFinite(o.reading.standardFlowM3S) && o.reading.standardFlowM3S >= 0)).map((o) => o.tag);
  const heading = <h4 className="font-semibold">Balancing {branchTag}: proportional method</h4>;
  if (usable.length < 2)
    return (
      <div className="rounded-card border border-dashed border-line-strong p-3">
        {heading}
        <p className="text-ink-soft">The plan appears once two or more outlets on {branchTag} are read.</p>
      </div>
    );

  const plan = proportionalBalance(
    usable.map((o) => ({ id: o.tag, branch: branchTag, designM3S: o.designFlowM3S, measuredM3S: o.reading.standardFlowM3S })),
    { tolerance },
  );
  const branch = plan.branches[0]!;
  const index = branch.steps.find((s) => s.role === "index");
  const rest = branch.steps.filter((s) => s.role !== "index");
  const differences = compareConditionsAcross(
    usable.map((o) => ({ label: `${o.tag}'s reading`, conditions: conditionsOf(o.reading.conditionsId) })),
    { formatPressure: (pa) => formatQuantity(units, "pressure", pa) },
  );

  return (
    <div className="grid gap-2 rounded-card border border-line bg-paper p-3">
      {heading}
      <p className="text-sm text-ink-soft">From each outlet&apos;s latest reading, at standard air; ratio = measured ÷ design.</p>
      {differences.length > 0 && (
        <div role="note" className="rounded-card border-2 border-caution bg-caution-soft p-2 text-sm">
          <p className="font-semibold">These readings were not all taken under the same operating conditions; compare them with care or re-read:</p>
          <ul className="list-disc pl-5">
            {differences.slice(0, 4).map((d) => (
              <li key={d.message}>{d.message}</li>
            ))}
          </ul>
        </div>
      )}
      {index ? (
        <p>
          Index outlet <strong>{index.id}</strong> <span className="num">(ratio {index.ratio.toFixed(3)})</span>: leave its damper fully open; it is the reference.
        </p>
      ) : (
        <p className="font-semibold text-fault">No outlet on {branchTag} can be the index: each is far below the others. Investigate them first.</p>
      )}
      {rest.length > 0 && (
        <ol className="list-decimal space-y-1 pl-6">
          {rest.map((s) => (
            <li key={s.id} className="num">
              <strong>{s.id}</strong> ratio {s.ratio.toFixed(3)} — {BALANCING_ROLES[s.role]}
              {s.role === "throttle" && s.targetM3S !== null && (
                <>
                  {" "}
                  {formatQuantity(units, "flow", s.targetM3S)} (ratio {s.targetRatio?.toFixed(3)})
                </>
              )}
            </li>
          ))}
        </ol>
      )}
      <p className="text-sm text-ink-soft">
        Throttling the others raises the index: re-read it after each step and re-aim at its new ratio. Outlets within 10 % of the index ratio are left alone (common practice). Once the
        branches are in proportion, the fan speed brings them towards design.
      </p>
      {(unread.length > 0 || unusable.length > 0) && (
        <p className="text-sm">
          {unread.length > 0 && <>Not read yet: {unread.join(", ")}. </>}
          {unusable.length > 0 && <>Left out (negative airflow): {unusable.join(", ")}.</>}
        </p>
      )}
    </div>
  );
}
