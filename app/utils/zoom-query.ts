// The zoom and phase a chart page's URL asks for (?phase, ?month, ?from, ?to), as plain strings.
export function zoomQuery(url: URL): { phase?: string; month?: string; from?: string; to?: string } {
  const get = (k: string) => url.searchParams.get(k)?.slice(0, 40) || undefined;
  return { phase: get("phase"), month: get("month"), from: get("from"), to: get("to") };
}
