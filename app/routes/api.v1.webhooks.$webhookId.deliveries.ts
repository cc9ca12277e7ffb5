import type { Route } from "./+types/api.v1.webhooks.$webhookId.deliveries";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { deliveryJson, getWebhook, listDeliveries } from "~/services/webhooks.server";

/** The endpoint's latest 50 deliveries, newest first: state, attempts, last status and response. */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "webhooks:manage", "admin");
    const webhook = await getWebhook(user.organisationId, idParam(params.webhookId, "Webhook"));
    return Response.json({ deliveries: (await listDeliveries(user.organisationId, { webhookId: webhook.id })).map(deliveryJson) });
  });
