import type { Route } from "./+types/api.v1.crossings.$crossingId.comparison";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { getCrossing } from "~/services/circuits.server";
import { crossingMarkingAndOptions } from "~/services/lighting-options.server";

/** The lighting options compared on present value and equivalent annual cost, with the recommendation: the crossing page's table. */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const crossing = await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing"));
    const { options } = await crossingMarkingAndOptions(user.organisationId, crossing);
    const { chart: _chart, demoLabel, ...comparison } = options;
    return Response.json({ crossingId: crossing.id, ...comparison, demoDefaultsNote: demoLabel });
  });
