import type { Route } from "./+types/api.v1.studies.$studyId.report[.]pdf";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { pdfResponse, studyReportPdf } from "~/services/report.server";

/** GET /api/v1/studies/{id}/report.pdf: the study report as a PDF (same service as the page's download). */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "studies:read");
    return pdfResponse(await studyReportPdf(user, idParam(params.studyId, "Study")));
  });
