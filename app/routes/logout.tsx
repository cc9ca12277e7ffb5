import { redirect } from "react-router";
import type { Route } from "./+types/logout";
import { destroyUserSession } from "~/utils/session.server";
import { assertSameOrigin } from "~/utils/csrf.server";

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  return destroyUserSession(request);
}

// Signing out changes state, so it is a POST only; a GET just goes home.
export async function loader() {
  throw redirect("/");
}
