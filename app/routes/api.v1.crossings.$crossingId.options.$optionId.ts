import type { Route } from "./+types/api.v1.crossings.$crossingId.options.$optionId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { deleteOption, getOption, optionValues, updateOption } from "~/services/lighting-options.server";
import { lightingOptionFormSchema } from "../../shared/lighting-option-schemas";

export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const option = await getOption(user.organisationId, idParam(params.crossingId, "Crossing"), idParam(params.optionId, "Lighting option"));
    return Response.json(optionValues(option));
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "PUT" && request.method !== "DELETE") return methodNotAllowed(["GET", "PUT", "DELETE"]);
    const user = await requireApiScope(context, "circuits:write", "engineer", "consultant");
    const crossingId = idParam(params.crossingId, "Crossing");
    const id = idParam(params.optionId, "Lighting option");
    if (request.method === "PUT") return Response.json(optionValues(await updateOption(user, crossingId, id, await readJson(request, lightingOptionFormSchema))));
    await deleteOption(user, crossingId, id);
    return new Response(null, { status: 204 });
  });
