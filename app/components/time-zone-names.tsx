// Suggestions for IANA time-zone inputs (any valid name is accepted; these are only offered).
// A fixed list, so the server and the browser render the same options.
export const COMMON_TIME_ZONES = [
  "UTC",
  "America/New_York",
  "America/Chicago",
  "America/Denver",
  "America/Phoenix",
  "America/Los_Angeles",
  "America/Anchorage",
  "Pacific/Honolulu",
  "America/Toronto",
  "America/Sao_Paulo",
  "Europe/London",
  "Europe/Paris",
  "Europe/Berlin",
  "Europe/Helsinki",
  "Africa/Johannesburg",
  "Asia/Kolkata",
  "Asia/Tokyo",
  "Australia/Sydney",
  "Pacific/Auckland",
] as const;

export function TimeZoneNames({ id = "time-zone-names" }: { id?: string }) {
  return (
    <datalist id={id}>
      {COMMON_TIME_ZONES.map((z) => (
        <option key={z} value={z} />
      ))}
    </datalist>
  );
}
