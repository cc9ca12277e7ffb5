import { methodNotAllowed, statelessComputeAction } from "~/utils/api.server";
import { runStatelessOptimise } from "~/services/optimise.server";
import { optimiseRequestSchema } from "../../shared/optimise-schemas";

export const loader = () => methodNotAllowed(["POST"]);

/** Stateless optimiser: samples or CSV and candidates in, every candidate and the cheapest go out, nothing saved. */
export const action = statelessComputeAction(optimiseRequestSchema, async (user, body) => Response.json(await runStatelessOptimise(user.organisationId, body)));
