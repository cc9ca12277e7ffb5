import type { Route } from "./+types/studies.$studyId.report[.]pdf";
import { requireUser } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { pdfResponse, studyReportPdf } from "~/services/report.server";

/** The study report as a PDF file (the same service as the API's report.pdf). */
export async function loader({ params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  return pdfResponse(await orNotFound(studyReportPdf(user, pageId(params.studyId))));
}
