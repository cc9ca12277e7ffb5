import { Form, isRouteErrorResponse, NavLink, Outlet, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/app-layout";
import { requireSignedInMiddleware, requireUser } from "~/utils/auth.server";
import { navFor } from "~/components/navigation";
import { Brand } from "~/components/brand";
import { ROLE_LABELS } from "../../shared/roles";

// Authenticates once per request for every page below; loaders read the user from the context.
export const middleware: Route.MiddlewareFunction[] = [requireSignedInMiddleware];

export async function loader({ context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  return { user: { name: user.name, email: user.email, role: user.role, organisationName: user.organisationName } };
}

type ShellUser = Route.ComponentProps["loaderData"]["user"];

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  return (
    <AppShell user={loaderData.user}>
      <Outlet />
    </AppShell>
  );
}

/** A 403, 404 or failure inside the app keeps the navigation, so the user is never stranded. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const layout = useRouteLoaderData<{ user: ShellUser }>("routes/app-layout");
  const { title, detail } = describeError(error);
  const body = (
    <div className="mx-auto max-w-xl py-8">
      <title>{`${title} · Duskline`}</title>
      <h1>{title}</h1>
      <p className="mt-3 text-night-200">{detail}</p>
      <p className="mt-6">
        <a href="/">Go to your home page</a>
      </p>
    </div>
  );
  return layout ? <AppShell user={layout.user}>{body}</AppShell> : <main className="mx-auto max-w-xl p-8">{body}</main>;
}

function describeError(error: unknown): { title: string; detail: string } {
  if (!isRouteErrorResponse(error)) {
    return { title: "Something went wrong", detail: "The page could not be shown. Try again, and tell your administrator if it keeps happening." };
  }
  const message = typeof error.data === "string" && error.data ? error.data : undefined;
  if (error.status === 404) return { title: "Not found", detail: message && message !== "Not found" ? message : "There is nothing at this address. Check the link, or go back to your home page." };
  if (error.status === 403) return { title: "Not allowed", detail: message ?? "Your role does not give access to this page." };
  return { title: `${error.status} ${error.statusText}`.trim(), detail: message ?? "The request could not be completed." };
}

function AppShell({ user, children }: { user: ShellUser; children: React.ReactNode }) {
  return (
    <div className="min-h-screen">
      <header className="no-print border-b border-night-800 bg-night-900/80">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <NavLink to="/" className="text-night-100 no-underline hover:no-underline">
            <Brand />
          </NavLink>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            {navFor(user.role).map((item) => (
              <NavLink
                key={item.to}
                to={item.to}
                end={item.to === "/"}
                className={({ isActive }) =>
                  `rounded-md px-3 py-1.5 text-sm no-underline hover:no-underline ${isActive ? "bg-night-700 text-amber-glow" : "text-night-200 hover:bg-night-800"}`
                }
              >
                {item.label}
              </NavLink>
            ))}
          </nav>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-night-200" title={user.email}>
              {user.name} · <span className="text-night-400">{ROLE_LABELS[user.role]}</span>
            </span>
            <Form method="post" action="/logout">
              <button type="submit" className="btn-quiet text-sm">
                Sign out
              </button>
            </Form>
          </div>
        </div>
      </header>
      <main className="mx-auto max-w-7xl px-4 py-6">
        {children}
      </main>
      <footer className="no-print mx-auto max-w-7xl px-4 pb-8 text-xs text-night-400">{user.organisationName}</footer>
    </div>
  );
}
