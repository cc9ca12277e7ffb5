import type { ReactNode } from "react";
import { useFetcher } from "react-router";

/** What a page action answers to a per-row change: a message, or field errors. */
type RowReply = { ok?: boolean; message?: string | null; errors?: Record<string, string[] | undefined> };

/**
 * One row's change (role, pause, revoke, retry) posted with its own fetcher: the page stays where
 * it is, only this row's controls wait, and the answer shows beside them; the loaders revalidate
 * afterwards, so the row redraws with its new state.
 */
export function RowAction({ children, confirmText, className }: { children: ReactNode; confirmText?: string; className?: string }) {
  const fetcher = useFetcher<RowReply>();
  const busy = fetcher.state !== "idle";
  const reply = busy ? undefined : fetcher.data;
  const firstError = Object.values(reply?.errors ?? {}).find((m) => m && m.length)?.[0];
  const failed = reply !== undefined && (reply.ok === false || firstError !== undefined);
  const message = reply?.message ?? firstError;
  return (
    <fetcher.Form method="post" className={className} aria-busy={busy} onSubmit={confirmText ? (e) => !confirm(confirmText) && e.preventDefault() : undefined}>
      <fieldset disabled={busy} className="contents">
        {children}
      </fieldset>
      {message && (
        <span role={failed ? "alert" : "status"} className={`block text-xs ${failed ? "text-verdict-nogo" : "text-verdict-go"}`}>
          {message}
        </span>
      )}
    </fetcher.Form>
  );
}
