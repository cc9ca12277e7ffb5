import type { Route } from "./+types/portfolio[.]csv";
import { requireUser } from "~/utils/auth.server";
import { portfolioRows } from "~/services/portfolio.server";
import { toCsv } from "../../shared/csv";
import { CSV_COLUMNS, csvRecords, rowsInView, viewFromSearchParams } from "../../shared/portfolio";

/**
 * Exactly the portfolio view the page shows (the same URL search params, filtered and sorted by
 * the same code), with units in the headers and values rounded as on the page; `toCsv` quotes and
 * neutralises formula-like cells.
 */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const view = viewFromSearchParams(new URL(request.url).searchParams);
  const rows = rowsInView(await portfolioRows(user.organisationId), view);
  const csv = toCsv(csvRecords(rows), { columns: CSV_COLUMNS });
  return new Response(csv + "\r\n", {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="duskline-portfolio-${new Date().toISOString().slice(0, 10)}.csv"` },
  });
}
