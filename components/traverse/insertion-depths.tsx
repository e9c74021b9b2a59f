/**
 * Where to mark the probe before the first reading: each line's insertion depths from the outside of
 * its test port (read position plus port offset), in the user's units. Points the probe head cannot
 * reach are flagged in words; so are points the layout moved off the wall.
 */
import { formatQuantity, type UnitSystem } from "@/lib/units";
import type { LayoutJson } from "@/lib/traverse/result-types";

export function InsertionDepths({ layout, units, portOffsetMm, round }: { layout: LayoutJson; units: UnitSystem; portOffsetMm: number; round: boolean }) {
  const mm = (v: number) => formatQuantity(units, "dimension", v);
  return (
    <div className="grid gap-3">
      <p className="text-sm text-ink-soft">
        Depths from the outside of each port{portOffsetMm > 0 ? `, including the ${mm(portOffsetMm)} port offset` : ""}. Probe head {mm(layout.probeHeadDiameterMm)}: it reaches {mm(layout.probeReachMm)} from a wall.
      </p>
      <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
        {layout.lines.map((line, k) => (
          <table key={k} className="w-full border-collapse text-left">
            <caption className="pb-1 text-left font-semibold">
              Port P{k + 1}
              {round && line.angleDeg !== undefined ? <span className="font-normal text-ink-soft"> · diameter at {Math.round(line.angleDeg)}°</span> : null}
              {!round && line.xMm !== undefined ? <span className="font-normal text-ink-soft"> · {mm(line.xMm)} from the left side</span> : null}
            </caption>
            <thead>
              <tr className="border-b border-line-strong text-sm text-ink-soft">
                <th scope="col" className="py-1 pr-2 font-semibold">
                  Point
                </th>
                <th scope="col" className="py-1 pr-2 font-semibold">
                  Mark the probe at
                </th>
                <th scope="col" className="py-1 font-semibold">
                  <span className="sr-only">Note</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {line.points.map((p, i) => (
                <tr key={i} className="border-b border-line">
                  <th scope="row" className="py-1 pr-2 font-semibold">
                    {i + 1}
                  </th>
                  <td className="num py-1 pr-2 text-lg">{mm(p.depthMm)}</td>
                  <td className="py-1 text-sm">
                    {p.beyondProbeReach && <span className="font-semibold text-caution">▲ head cannot reach; read at {mm(layout.probeReachMm)} from the wall</span>}
                    {p.movedFromWall && <span className="text-ink-soft">moved off the wall</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ))}
      </div>
    </div>
  );
}
