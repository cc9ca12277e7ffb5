import { Link } from "react-router";
import type { Route } from "./+types/studies.$studyId.report";
import { requireUser } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { studyReport } from "~/services/report.server";
import { StudyReport } from "~/components/study-report";

export async function loader({ params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const id = pageId(params.studyId);
  return { id, model: await orNotFound(studyReport(user, id)) };
}

export default function StudyReportPage({ loaderData }: Route.ComponentProps) {
  const { id, model } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`${model.title} · Duskline`}</title>
      <nav className="no-print flex flex-wrap gap-2" aria-label="Report">
        <Link to={`/studies/${id}`} className="btn-quiet">
          Back to the study
        </Link>
        <a href={`/studies/${id}/report.pdf`} className="btn-quiet" download>
          Download PDF
        </a>
        <button type="button" className="btn" onClick={() => window.print()}>
          Print
        </button>
      </nav>
      <StudyReport model={model} />
    </div>
  );
}
