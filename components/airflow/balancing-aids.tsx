import type { BranchPlan, TerminalRole } from "@/lib/airflow/balancing";
import type { FanAid } from "@/lib/server/airflow-view";
import { formatQuantity, type UnitSystem } from "@/lib/units";

/** What each step of a proportional-balancing plan asks for, in words. */
export const BALANCING_ROLES: Record<TerminalRole, string> = {
  index: "Reference: leave fully open",
  throttle: "Throttle to",
  leave: "Leave: already close to the reference ratio",
  investigate: "Investigate: far below design",
};

/** Branch-to-branch proportional balancing and the fan speed that would reach design, from today's readings. */
export function BalancingAids({ plans, fan, units }: { plans: BranchPlan[]; fan: FanAid | null; units: UnitSystem }) {
  if (plans.length === 0 && !fan) return <p className="text-ink-soft">Balancing aids appear once the branches below a junction, or the fan&apos;s trunk, have reduced traverses.</p>;
  return (
    <div className="space-y-4">
      {plans.map((plan) => (
        <div key={plan.branch}>
          <p className="font-semibold">
            Below {plan.branch}, in working order (ratio = measured ÷ design, standard air)
          </p>
          <ol className="mt-1 list-decimal space-y-1 pl-6">
            {plan.steps.map((step) => (
              <li key={step.id} className="num">
                <strong>{step.id}</strong> ratio {step.ratio.toFixed(3)} — {BALANCING_ROLES[step.role]}
                {step.role === "throttle" && step.targetM3S !== null && (
                  <>
                    {" "}
                    {formatQuantity(units, "flow", step.targetM3S)} (ratio {step.targetRatio?.toFixed(3)})
                  </>
                )}
              </li>
            ))}
          </ol>
        </div>
      ))}
      {fan && (
        <p className="num">
          <strong>Fan:</strong> {formatQuantity(units, "flow", fan.measuredFlowM3S)} measured against {formatQuantity(units, "flow", fan.designFlowM3S)} design at{" "}
          {Math.round(fan.speedRpm)} rpm. About {Math.round(fan.targetSpeedRpm)} rpm would reach design (fan laws), with fan pressure ×{fan.pressureFactor.toFixed(2)} and
          shaft power ×{fan.powerFactor.toFixed(2)} of today&apos;s. Balance the branches first and re-measure: throttling lowers the total. Check the motor rating and
          the fan&apos;s maximum speed before changing drives.
        </p>
      )}
    </div>
  );
}
