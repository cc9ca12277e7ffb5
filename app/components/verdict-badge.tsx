import type { VerdictStatus } from "../../shared/study-schemas";

// Own labels and colours for the four verdicts; the shape differs too, so colour is not the only cue.
export const VERDICT_LABELS: Record<VerdictStatus, string> = {
  go: "Go",
  marginal: "Marginal",
  "no-go": "No-go",
  "insufficient-data": "Insufficient data",
};
const STYLE: Record<VerdictStatus, { cls: string; mark: string }> = {
  go: { cls: "bg-verdict-go/15 text-verdict-go border-verdict-go/50", mark: "●" },
  marginal: { cls: "bg-verdict-marginal/15 text-verdict-marginal border-verdict-marginal/50", mark: "◐" },
  "no-go": { cls: "bg-verdict-nogo/15 text-verdict-nogo border-verdict-nogo/50", mark: "○" },
  "insufficient-data": { cls: "bg-verdict-nodata/15 text-verdict-nodata border-verdict-nodata/50", mark: "?" },
};

export function VerdictBadge({ status, large = false }: { status: VerdictStatus | null; large?: boolean }) {
  if (!status) return <span className="text-night-400">not studied</span>;
  const s = STYLE[status];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 font-semibold ${large ? "text-lg" : "text-sm"} ${s.cls}`}>
      <span aria-hidden="true">{s.mark}</span>
      {VERDICT_LABELS[status]}
    </span>
  );
}
