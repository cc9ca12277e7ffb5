import type { Route } from "./+types/api.v1.openapi[.]json";
import { openApiDocument } from "~/services/openapi.server";

// Public, so integrators can read the contract before they have a session.
export function loader({ request }: Route.LoaderArgs) {
  return Response.json(openApiDocument(new URL("/api/v1", request.url).toString()));
}
