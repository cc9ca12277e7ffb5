import type { Route } from "./+types/api.v1.profiles.$profileId.quality";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { getProfile } from "~/services/profiles.server";

/** The data-quality report of a load profile: coverage by month, gaps, flatlines, zero-current stretches. */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const profile = await getProfile(user.organisationId, idParam(params.profileId, "Load profile"));
    return Response.json({ profileId: profile.id, quality: profile.quality });
  });
