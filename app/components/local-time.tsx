import { formatUtc } from "../../shared/format";
import { formatLocal } from "../../shared/zoned-time";

/** A time in the circuit's zone, with UTC on hover (and in the markup, for copying and exports). */
export function LocalTime({ iso, zone }: { iso: string; zone: string }) {
  return (
    <time dateTime={iso} title={formatUtc(iso)} className="figure">
      {formatLocal(iso, zone)}
    </time>
  );
}
