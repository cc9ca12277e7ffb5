import { useEffect } from "react";
import { Link, redirect, useRevalidator } from "react-router";
import type { Route } from "./+types/jobs.$jobId";
import { requireUser } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { ensureJobRunner, getJob, jobJson } from "~/services/jobs.server";
import { FormMessage } from "~/components/forms";
import { formatPercent, formatUtc } from "../../shared/format";

const KIND_LABELS: Record<string, string> = {
  "study.run": "Feasibility study with both solvers",
  "optimise.crossing": "Optimiser: the cheapest device for a crossing",
  "optimise.fleet": "Optimiser: the cheapest device per crossing",
};
const POLL_MS = 1000;

export async function loader({ params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  ensureJobRunner();
  const job = jobJson(await orNotFound(getJob(user.organisationId, pageId(params.jobId))));
  const studyId = job.state === "done" ? Number((job.result as { studyId?: number } | null)?.studyId) : NaN;
  // Done: straight to what it made.
  if (Number.isInteger(studyId) && studyId > 0) throw redirect(`/studies/${studyId}`);
  if (job.state === "done" && job.kind.startsWith("optimise.") && job.resultUrl?.startsWith("/")) throw redirect(job.resultUrl);
  return { job };
}

export default function JobProgress({ loaderData }: Route.ComponentProps) {
  const { job } = loaderData;
  const revalidator = useRevalidator();
  const active = job.state === "queued" || job.state === "running";
  // Poll the loader while the job runs; the loader redirects once it is done.
  useEffect(() => {
    if (!active) return;
    const timer = setInterval(() => {
      if (revalidator.state === "idle") void revalidator.revalidate();
    }, POLL_MS);
    return () => clearInterval(timer);
  }, [active, revalidator]);
  const label = KIND_LABELS[job.kind] ?? job.kind;
  return (
    <div className="flex max-w-2xl flex-col gap-4">
      <title>{`Job ${job.id} · Duskline`}</title>
      <h1>{label}</h1>
      <p className="text-night-200">
        Long work runs in the background, so you can leave this page and come back: the result is saved when it is done. Queued {formatUtc(job.createdAt)}
        {job.startedAt && `, started ${formatUtc(job.startedAt)}`}.
      </p>
      <section className="card flex flex-col gap-3" aria-labelledby="job-state">
        <h2 id="job-state">
          {job.state === "queued" ? "Waiting for a free worker" : job.state === "running" ? "Running" : job.state === "failed" ? "Failed" : "Done"}
        </h2>
        <div className="h-3 w-full overflow-hidden rounded bg-night-800" role="progressbar" aria-label="Progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(job.progress * 100)}>
          <div className="h-full bg-amber-glow transition-all" style={{ width: `${Math.round(job.progress * 100)}%` }} />
        </div>
        <p className="figure text-sm text-night-200">{formatPercent(job.progress, 0)}</p>
        {job.attempts > 1 && active && <p className="text-sm text-night-400">Taken over after the app instance running it stopped (attempt {job.attempts}).</p>}
        {job.state === "failed" && job.error && (
          <FormMessage tone="error">
            {job.error.title}: {job.error.detail}
          </FormMessage>
        )}
        {job.state === "done" && job.resultUrl && (
          <p>
            Done. <a href={job.resultUrl}>Open the result</a>.
          </p>
        )}
      </section>
      <p>
        <Link to="/circuits">Back to circuits</Link>
      </p>
    </div>
  );
}
