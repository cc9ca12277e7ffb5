import type { Route } from "./+types/api.v1.notice-check";
import { ZodError } from "zod";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { problem, zodErrors } from "~/utils/http.server";
import { checkNotice } from "../../lib/notice/part77";
import { noticeCheckRequestSchema } from "../../shared/notice-schemas";

export const loader = () => methodNotAllowed(["POST"]);

/** 14 CFR 77.9 notice check; stateless, any signed-in role. Invalid fields: 422 naming each. */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    await requireApiUser(context);
    try {
      return Response.json(checkNotice(await readJson(request, noticeCheckRequestSchema)));
    } catch (error) {
      if (error instanceof ZodError) return problem(422, "Invalid request", "Some fields are not valid; see errors.", { errors: zodErrors(error.issues) });
      throw error;
    }
  });
