import { useMemo, useState } from "react";
import { COMPARISON_CURRENTS_A, harvestCurve } from "../../lib/engine/harvest-curve";
import type { Device } from "../../shared/study-schemas";
import { formatNumber } from "../../shared/format";
import { ChartFrame } from "./charts/chart-frame";
import { AxisScaleToggle, CURVE_COLOURS, HarvestCurves } from "./charts/harvest-curves";

export interface ComparedDevice {
  id: number;
  name: string;
  spec: Device;
  harvestW: number[];
  carriesLoadFromA: number | null;
}

/** Two or more device profiles' harvest curves on one chart, with their figures side by side. */
export function DeviceComparison({ devices }: { devices: ComparedDevice[] }) {
  const [scale, setScale] = useState<"log" | "linear">("log");
  const curves = useMemo(
    () => devices.map((d, k) => ({ name: d.name, colour: CURVE_COLOURS[k % CURVE_COLOURS.length], rows: harvestCurve(d.spec, scale) })),
    [devices, scale],
  );
  return (
    <section className="flex flex-col gap-3" aria-labelledby="compare-heading" data-testid="device-comparison">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="compare-heading">Harvest curves compared</h2>
        <AxisScaleToggle scale={scale} onChange={setScale} />
      </div>
      <ChartFrame
        title={devices.map((d) => d.name).join(" · ")}
        height={300}
        summary={devices
          .map((d) => `${d.name}: nothing below ${d.spec.minCurrentA} A; ${d.carriesLoadFromA === null ? `never carries its ${d.spec.loadW} W load up to ${d.spec.maxCurrentA} A` : `carries its ${d.spec.loadW} W load from ${formatNumber(d.carriesLoadFromA, 1)} A`}.`)
          .join(" ")}
      >
        <HarvestCurves curves={curves} scale={scale} />
      </ChartFrame>
      <div className="card overflow-x-auto">
        <table>
          <caption className="text-left text-sm text-night-400">Harvest at the same line currents (0 below a device's minimum current)</caption>
          <thead>
            <tr>
              <th scope="col">Device profile</th>
              <th scope="col">Min current</th>
              <th scope="col">Load</th>
              <th scope="col">Storage</th>
              <th scope="col">Carries its load from</th>
              {COMPARISON_CURRENTS_A.map((a) => (
                <th key={a} scope="col">
                  at {formatNumber(a)} A
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {devices.map((d) => (
              <tr key={d.id}>
                <th scope="row">{d.name}</th>
                <td className="figure">{d.spec.minCurrentA} A</td>
                <td className="figure">{d.spec.loadW} W</td>
                <td className="figure">{d.spec.storageWh} Wh</td>
                <td className="figure">{d.carriesLoadFromA === null ? "never" : `${formatNumber(d.carriesLoadFromA, 1)} A`}</td>
                {d.harvestW.map((w, k) => (
                  <td key={COMPARISON_CURRENTS_A[k]} className="figure">
                    {formatNumber(w, 2)} W
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
