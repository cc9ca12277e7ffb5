// The study report: gathers a study, its crossing's marker plan, options, review and the profile's
// quality report into lib/report's model. The printable page, GET /studies/{id}/report.pdf and
// GET /api/v1/studies/{id}/report.pdf all call studyReport.
import { Circuit, Crossing } from "../../db/models";
import { buildStudyReport, type StudyReportModel } from "../../lib/report/study-report";
import { fingerprint } from "../../lib/review/staleness";
import { CROSSING_KIND_LABELS } from "../../shared/circuit-schemas";
import { markingPlan } from "./crossing-marking.server";
import { reliedReferences, supportLightsInUse } from "../../lib/crossings/plan";
import { crossingOptionsView } from "./lighting-options.server";
import { getProfile } from "./profiles.server";
import { reviewOf } from "./reviews.server";
import { getStudy, staleReasons, studyJson } from "./studies.server";
import { LRUCache } from "lru-cache";
import { renderReportPdfOffThread } from "../utils/worker-pool.server";

export async function studyReport(user: { organisationId: number; organisationName: string }, studyId: number): Promise<StudyReportModel> {
  const { organisationId } = user;
  const study = await getStudy(organisationId, studyId);
  const json = studyJson(study);
  const [crossing, circuit, stale, profile] = await Promise.all([
    Crossing.findOne({ where: { id: study.crossingId, organisationId } }),
    Circuit.findOne({ where: { id: study.circuitId, organisationId } }),
    staleReasons(organisationId, study),
    study.profileId ? getProfile(organisationId, study.profileId).catch(() => null) : Promise.resolve(null),
  ]);
  const marking = crossing && circuit ? await markingPlan(crossing, circuit) : null;
  const plan = marking?.plan;
  const [options, review] = crossing && marking
    ? await Promise.all([crossingOptionsView(organisationId, crossing, marking), reviewOf(organisationId, crossing)])
    : [null, null];
  return buildStudyReport({
    generatedAt: new Date().toISOString(),
    organisation: user.organisationName,
    study: { id: json.id, createdAt: json.createdAt, inputsFingerprint: fingerprint(study.inputs), inputs: json.inputs, results: json.results, staleReasons: stale },
    crossing: crossing ? { id: crossing.id, name: crossing.name, kind: CROSSING_KIND_LABELS[crossing.kind], spanLength: { value: crossing.spanLengthValue, unit: crossing.spanLengthUnit } } : null,
    circuit: circuit ? { name: circuit.name, voltageKv: circuit.voltageKv } : null,
    layout: plan?.ok ? plan.layout : null,
    curve: plan?.ok ? plan.curve : null,
    layoutErrors: plan && !plan.ok ? plan.errors.map((e) => e.message) : [],
    options: options
      ? {
          currency: options.currency,
          rows: options.comparison.rows,
          recommendation: options.comparison.recommendation ? { name: options.comparison.recommendation.name, reasons: options.comparison.recommendation.reasons } : null,
          units: Object.fromEntries(options.options.map((o) => [String(o.id), `${o.effectiveUnits} (${o.unitsBasis})`])),
        }
      : { currency: "USD", rows: [], recommendation: null },
    review,
    rules: marking ? reliedReferences(marking.plan, marking.litSuitability, supportLightsInUse(marking.litSuitability, options?.options.map((o) => o.kind) ?? [])) : [],
    optionNames: Object.fromEntries((options?.options ?? []).map((o) => [o.id, o.name])),
    quality: (profile?.quality as StudyReportInputsQuality | undefined) ?? null,
  });
}

type StudyReportInputsQuality = Parameters<typeof buildStudyReport>[0]["quality"];

/**
 * The same content (everything but the generation time) gives the same file, so callers asking
 * for an unchanged report share one rendering, including ones that ask at the same moment (the
 * promise is cached).
 */
const rendered = new LRUCache<string, Promise<Buffer>>({ max: 20 });

function cachedPdf(model: StudyReportModel): Promise<Buffer> {
  const key = fingerprint({ ...model, generatedAt: null });
  let pdf = rendered.get(key);
  if (!pdf) {
    pdf = renderReportPdfOffThread(model);
    pdf.catch(() => rendered.delete(key));
    rendered.set(key, pdf);
  }
  return pdf;
}

/** The report as PDF bytes, with a file name for the download. */
export async function studyReportPdf(user: { organisationId: number; organisationName: string }, studyId: number) {
  const model = await studyReport(user, studyId);
  const bytes = await cachedPdf(model);
  return { bytes, filename: `duskline-study-${studyId}-report.pdf` };
}

export function pdfResponse(pdf: { bytes: Buffer; filename: string }) {
  return new Response(new Uint8Array(pdf.bytes), {
    headers: { "Content-Type": "application/pdf", "Content-Disposition": `attachment; filename="${pdf.filename}"`, "Cache-Control": "private, no-store" },
  });
}
