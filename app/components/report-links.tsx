/** Links to a study's report: the PDF file and the printable page (both built by services/report.server.ts). */
export function ReportLinks({ studyId }: { studyId: number }) {
  return (
    <>
      <a href={`/studies/${studyId}/report.pdf`} className="btn-quiet" download>
        Report (PDF)
      </a>
      <a href={`/studies/${studyId}/report`} className="btn-quiet">
        Printable report
      </a>
    </>
  );
}
