import type { Route } from "./+types/api.v1.notice-check";
import { ZodError } from "zod";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { problem, zodErrors } from "~/utils/http.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { checkNotice } from "../../lib/notice/part77";
import { noticeCheckRequestSchema } from "../../shared/notice-schemas";

export const loader = () => methodNotAllowed(["POST"]);

/** 14 CFR 77.9 notice check; stateless, any signed-in role. Invalid fields: 422 naming each. */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "feasibility:run");
    const read = (request: Request) =>
      readJson(request, noticeCheckRequestSchema).catch((error) => {
        if (error instanceof ZodError) throw problem(422, "Invalid request", "Some fields are not valid; see errors.", { errors: zodErrors(error.issues) });
        throw error;
      });
    return withIdempotentWork(request, user.organisationId, read, async (body) => Response.json(checkNotice(body)));
  });
