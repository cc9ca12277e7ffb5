import type { ReactNode } from "react";
import { Brand } from "./brand";

/** Frame for the signed-out pages: sign-in, invitation, password reset. */
export function AuthPage({ title, children }: { title: string; children: ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center p-4">
      <title>{`${title} · Duskline`}</title>
      <div className="w-full max-w-sm">
        <Brand className="mb-6 text-xl text-night-100" />
        <div className="card flex flex-col gap-4">
          <h1>{title}</h1>
          {children}
        </div>
        <p className="mt-4 text-xs text-night-400">
          Planning aid for line-powered obstruction lighting. Rule sets, local codes, the aviation authority and licensed engineering judgement govern.
        </p>
      </div>
    </main>
  );
}
