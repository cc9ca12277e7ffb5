import type { Route } from "./+types/api.v1.webhooks.$webhookId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed } from "~/utils/api.server";
import { deleteWebhook, getWebhook, webhookJson } from "~/services/webhooks.server";

export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "webhooks:manage", "admin");
    return Response.json(webhookJson(await getWebhook(user.organisationId, idParam(params.webhookId, "Webhook"))));
  });

/** Removes the endpoint and its delivery log (204). */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "DELETE") return methodNotAllowed(["GET", "DELETE"]);
    const user = await requireApiScope(context, "webhooks:manage", "admin");
    await deleteWebhook(user, idParam(params.webhookId, "Webhook"));
    return new Response(null, { status: 204 });
  });
