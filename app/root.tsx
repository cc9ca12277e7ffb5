import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen">
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "The page could not be shown. Try again, and tell your administrator if it keeps happening.";
  let stack: string | undefined;
  let retry = false;
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      title = "Page not found";
      detail = "There is nothing at this address. Check the link, or go back to your home page.";
    } else if (error.status === 503) {
      // The database is away (app/utils/db.server.ts): say so, and that a retry is safe.
      title = "Duskline is briefly unavailable";
      detail = "It cannot reach its database just now. Nothing was saved by your last action. Wait a minute and try again.";
      retry = true;
    } else if (error.status === 403) {
      title = "Not allowed";
      detail = typeof error.data === "string" && error.data ? error.data : "Your role does not give access to this page.";
    } else {
      title = `${error.status} ${error.statusText}`;
      if (typeof error.data === "string" && error.data) detail = error.data;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
    stack = error.stack;
  }
  return (
    <main className="mx-auto max-w-xl p-8">
      <title>{`${title} · Duskline`}</title>
      <p className="mb-2 font-mono text-sm text-amber-glow">Duskline</p>
      <h1>{title}</h1>
      <p className="mt-3 text-night-200">{detail}</p>
      {stack && <pre className="mt-4 overflow-x-auto rounded bg-night-900 p-4 text-xs">{stack}</pre>}
      <p className="mt-6 flex gap-6">
        {retry && <a href="">Try again</a>}
        <a href="/">Go to your home page</a>
      </p>
    </main>
  );
}
