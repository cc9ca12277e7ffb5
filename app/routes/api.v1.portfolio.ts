import type { Route } from "./+types/api.v1.portfolio";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse } from "~/utils/api.server";
import { portfolio } from "~/services/portfolio.server";

export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "portfolio:read");
    return Response.json(await portfolio(user.organisationId));
  });
