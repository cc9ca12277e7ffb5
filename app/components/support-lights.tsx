import { Link } from "react-router";
import type { SupportLighting } from "../../lib/markers/support-lights";
import { formatLength, type DistanceUnit } from "../../shared/units";
import { RuleStatus } from "./rule-status";

const LEVEL_WORDS = { top: "top", middle: "midway", bottom: "catenary low point" } as const;

/** The support-structure lights of the layout: where each is, the flash sequence, type and the rules with their status. */
export function SupportLightsList({ lighting, unit }: { lighting: SupportLighting; unit: DistanceUnit }) {
  return (
    <div className="flex flex-col gap-2 text-sm" data-testid="support-lights">
      <p>
        <span className="font-semibold" data-testid="support-light-count">{`${lighting.count.total} lights`}</span>
        {`: ${lighting.count.basis}. They flash ${lighting.sequence.map((l) => LEVEL_WORDS[l]).join(", then ")} at about ${lighting.flashesPerMinute} flashes a minute; ${lighting.lightType}.`}
      </p>
      <table>
        <thead>
          <tr>
            <th scope="col">Support</th>
            <th scope="col">Level</th>
            <th scope="col">Height above ground or water</th>
            <th scope="col">Flashes</th>
          </tr>
        </thead>
        <tbody>
          {lighting.lights.map((l) => (
            <tr key={`${l.support}-${l.level}`}>
              <td>{l.support}</td>
              <td>{LEVEL_WORDS[l.level]}</td>
              <td className="figure">{formatLength({ value: l.height, unit }, { maximumFractionDigits: 1 })}</td>
              <td className="figure">{`${l.flashOrder} of 3`}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <ul className="text-xs text-night-400">
        {lighting.references.map((r) => (
          <li key={r.key}>
            <Link to={`/rules/${r.key}`}>{r.title}</Link>
            {` (${r.section}): `}
            <RuleStatus source={r} />
          </li>
        ))}
      </ul>
    </div>
  );
}
