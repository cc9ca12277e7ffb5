import type { Route } from "./+types/api.v1.webhooks";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { createWebhook, listWebhooks, webhookJson } from "~/services/webhooks.server";
import { withIdempotency } from "~/services/idempotency.server";
import { webhookInputSchema } from "../../shared/webhook-schemas";

// Admins manage webhooks (a `webhooks:manage` key scope may take this over).
export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "webhooks:manage", "admin");
    const { items, next } = pageOf((await listWebhooks(user.organisationId)).map(webhookJson), pageRequest(request));
    return Response.json({ webhooks: items, next });
  });

/** Registers an endpoint: 201 with the signing secret, shown this once. */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "webhooks:manage", "admin");
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const input = await readJson(request, webhookInputSchema);
      return save(async (transaction) => {
        const { webhook, secret } = await createWebhook(user, input, transaction);
        return Response.json({ ...webhookJson(webhook), secret }, { status: 201, headers: { Location: `/api/v1/webhooks/${webhook.id}` } });
      });
    });
  });
