import type { Route } from "./+types/api.v1.crossings.$crossingId.options";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, created, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { getCrossing } from "~/services/circuits.server";
import { createOption, listOptions, optionValues } from "~/services/lighting-options.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { lightingOptionFormSchema } from "../../shared/lighting-option-schemas";

/** The crossing's lighting options as stored (the comparison is at /crossings/{id}/comparison). */
export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const crossing = await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing"));
    const { items, next } = pageOf(await listOptions(user.organisationId, crossing.id), pageRequest(request));
    return Response.json({ options: items.map(optionValues), next });
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "circuits:write", "engineer", "consultant");
    const crossingId = idParam(params.crossingId, "Crossing");
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, lightingOptionFormSchema),
      async (input) => {
        const option = await createOption(user, crossingId, input);
        return created(optionValues(option), `/api/v1/crossings/${crossingId}/options/${option.id}`);
      },
    );
  });
