import type { Route } from "./+types/api.v1.portfolio";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse } from "~/utils/api.server";
import { portfolio } from "~/services/portfolio.server";

export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    return Response.json(await portfolio(user.organisationId));
  });
