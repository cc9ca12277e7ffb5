// Worker-thread entry for the study report PDF (renderReportPdfOffThread in
// app/utils/worker-pool.server.ts): laying out a PDF takes seconds of CPU, which must not hold up
// the event loop that serves everyone else.
// Plain JavaScript that loads the TypeScript through tsx's tsImport: with `--import tsx` in the
// worker's execArgv (as the engine pool does), Node refused the .ts/.tsx files once
// @react-pdf/renderer was in the module graph ("Unknown file extension").
import { tsImport } from "tsx/esm/api";

const { renderReportPdf } = await tsImport("./report-pdf.server.tsx", import.meta.url);

/** @param {import("../../lib/report/study-report").StudyReportModel} model */
export default async function renderReportPdfTask(model) {
  return new Uint8Array(await renderReportPdf(model));
}
