import { problem } from "~/utils/http.server";

// Unknown API addresses answer problem+json rather than the HTML 404 page.
const notFound = () => problem(404, "Not found", "There is no API endpoint at this address. See /api/v1/openapi.json.");
export const loader = notFound;
export const action = notFound;
