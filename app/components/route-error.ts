import { isRouteErrorResponse } from "react-router";

export interface RouteErrorText {
  title: string;
  detail: string;
  /** Whether trying the same thing again can work (the database was away). */
  retry: boolean;
}

/** What the error boundaries (root and app layout) say about an error, in one place. */
export function describeRouteError(error: unknown): RouteErrorText {
  if (!isRouteErrorResponse(error)) {
    return { title: "Something went wrong", detail: "The page could not be shown. Try again, and tell your administrator if it keeps happening.", retry: false };
  }
  const message = typeof error.data === "string" && error.data ? error.data : undefined;
  switch (error.status) {
    case 404:
      return { title: "Page not found", detail: message && message !== "Not found" ? message : "There is nothing at this address. Check the link, or go back to your home page.", retry: false };
    case 403:
      return { title: "Not allowed", detail: message ?? "Your role does not give access to this page.", retry: false };
    case 503:
      // The database is away (app/utils/db.server.ts) or the server is restarting.
      return {
        title: "Duskline is briefly unavailable",
        detail: "It cannot reach its database just now. Nothing was saved by your last action. Wait a minute and try again.",
        retry: true,
      };
    default:
      return { title: `${error.status} ${error.statusText}`.trim(), detail: message ?? "The request could not be completed.", retry: false };
  }
}
