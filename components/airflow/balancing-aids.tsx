import type { BranchPlan, TerminalRole } from "@/lib/airflow/balancing";
import type { FanAid } from "@/lib/server/airflow-view";
import type { FanMotor } from "@/lib/server/system-view";
import { formatQuantity, type UnitSystem } from "@/lib/units";

/** What each step of a proportional-balancing plan asks for, in words. */
export const BALANCING_ROLES: Record<TerminalRole, string> = {
  index: "Reference: leave fully open",
  throttle: "Throttle to",
  leave: "Leave: already close to the reference ratio",
  investigate: "Investigate: far below design",
};

/** Branch-to-branch proportional balancing and the fan speed that would reach design, from today's readings. */
export function BalancingAids({ plans, fan, units, motor = null }: { plans: BranchPlan[]; fan: FanAid | null; units: UnitSystem; motor?: FanMotor | null }) {
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
        <>
          <p className="num">
            <strong>Fan:</strong> {formatQuantity(units, "flow", fan.measuredFlowM3S)} measured against {formatQuantity(units, "flow", fan.designFlowM3S)} design at{" "}
            {Math.round(fan.speedRpm)} rpm. About {Math.round(fan.targetSpeedRpm)} rpm would reach design (fan laws), with fan pressure ×{fan.pressureFactor.toFixed(2)} and
            shaft power ×{fan.powerFactor.toFixed(2)} of today&apos;s. Balance the branches first and re-measure: throttling lowers the total.
          </p>
          {motor?.headroom && fan.powerFactor > 1 && (
            <p className="num">
              <strong>Motor:</strong> at {Math.round(fan.targetSpeedRpm)} rpm the fan laws put the shaft power at ×{motor.headroom.powerFactor.toFixed(2)} of today&apos;s, so the{" "}
              {motor.headroom.nameplateKw.toFixed(1)} kW nameplate holds only if the motor draws less than {motor.headroom.maxPresentKw.toFixed(2)} kW today (
              {motor.headroom.maxPresentPctOfNameplate.toFixed(0)} % of nameplate).
              {motor.fullLoadAmps !== null && <> Measure the running current against the nameplate {motor.fullLoadAmps.toFixed(1)} A full-load amps before deciding.</>}
              {motor.headroom.maxPresentWithServiceFactorKw !== null && (
                <> The service factor {motor.serviceFactor?.toFixed(2)} is a margin for occasional overload, not running capacity.</>
              )}
            </p>
          )}
          {motor?.nameplateMissing && fan.powerFactor > 1 && <p>The motor nameplate is not recorded for this system: add it in Set-up to see what the speed change asks of the motor.</p>}
          <p role="note" className="rounded-card border-2 border-caution bg-caution-soft p-3">
            <strong>Before any speed increase:</strong> motor and drive limits (nameplate amps and power, service factor, drive and belt ratings, the fan&apos;s maximum safe
            speed) must be checked by a qualified person. Changing pulleys or drive settings is work on rotating and energised equipment: lock out and tag out, and follow
            site rules and local codes.
          </p>
        </>
      )}
    </div>
  );
}
