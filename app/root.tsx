import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { useNonce } from "./utils/request-context";
import "./app.css";
import { describeRouteError } from "./components/route-error";

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
  const { title, detail, retry } = describeRouteError(error);
  const stack = import.meta.env.DEV && error instanceof Error ? error.stack : undefined;
  return (
    <main className="mx-auto max-w-xl p-8">
      <title>{`${title} · Duskline`}</title>
      <p className="mb-2 font-mono text-sm text-amber-glow">Duskline</p>
      <h1>{title}</h1>
      <p className="mt-3 text-night-200">{import.meta.env.DEV && error instanceof Error ? error.message : detail}</p>
      {stack && <pre className="mt-4 overflow-x-auto rounded bg-night-900 p-4 text-xs">{stack}</pre>}
      <p className="mt-6 flex gap-6">
        {retry && <a href="">Try again</a>}
        <a href="/">Go to your home page</a>
      </p>
    </main>
  );
}
