import { Link } from "react-router";
import type { NoticeView } from "~/services/aviation-record.server";
import type { AviationRecord } from "../../shared/aviation-record-schemas";
import { formatLength } from "../../shared/units";

/** Structure numbers, the authority's determination and the 14 CFR 77.9 notice check, on the crossing page. */
export function AviationRecordPanel({ crossingId, record, notice, canEdit }: { crossingId: number; record: AviationRecord | null; notice: NoticeView; canEdit: boolean }) {
  const r = record ?? {};
  return (
    <section className="card flex flex-col gap-3" aria-labelledby="aviation-heading" data-testid="aviation-record">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="aviation-heading">Aviation record and notice to the FAA</h2>
        {canEdit && (
          <Link to={`/crossings/${crossingId}/aviation`} className="btn-quiet no-print">
            Edit the aviation record
          </Link>
        )}
      </div>
      <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[max-content_1fr]">
        <dt className="text-night-400">Structures</dt>
        <dd>{`A: ${r.structureNumberA ?? "not recorded"} · B: ${r.structureNumberB ?? "not recorded"}`}</dd>
        <dt className="text-night-400">Determination</dt>
        <dd>
          {r.determinationNumber
            ? `Aeronautical study ${r.determinationNumber}${r.determinationDate ? ` of ${r.determinationDate}` : ""}${r.determinationRequires ? `: requires ${r.determinationRequires}` : ""}`
            : "No determination recorded."}
        </dd>
      </dl>
      <div className="text-sm" data-testid="notice-check">
        {notice.result === null ? (
          <p className="text-night-400">{notice.missing}</p>
        ) : (
          <>
            <p className={`font-semibold ${notice.result.noticeRequired ? "text-verdict-marginal" : "text-verdict-go"}`}>
              {notice.result.noticeRequired
                ? `Notice to the FAA is required for the ${formatLength(notice.heightAgl, { maximumFractionDigits: 1 })} support (14 CFR 77.9).`
                : `No notice is required under 14 CFR 77.9 (a) or (b) for the ${formatLength(notice.heightAgl, { maximumFractionDigits: 1 })} support.`}
            </p>
            <ul className="list-disc pl-5 text-night-200">
              {notice.result.reasons.map((reason) => (
                <li key={reason.rule}>{`${reason.rule}: ${reason.text}${reason.exceeded ? ` Exceeded by ${formatLength(reason.exceedsBy, { maximumFractionDigits: 1 })}.` : ""}`}</li>
              ))}
            </ul>
            <p className="text-xs text-night-400">{`Not evaluated: ${notice.result.notEvaluated.join("; ")}. The aviation authority's determination governs.`}</p>
          </>
        )}
      </div>
    </section>
  );
}
