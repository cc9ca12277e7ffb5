import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { useNonce } from "./utils/request-context";
import "./app.css";

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
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
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
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
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      title = "Page not found";
      detail = "There is nothing at this address. Check the link, or go back to your home page.";
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
      <p className="mt-6">
        <a href="/">Go to your home page</a>
      </p>
    </main>
  );
}
