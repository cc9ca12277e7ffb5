import type { Route } from "./+types/dev.mail";
import { getEnv } from "~/utils/env.server";
import { requireRole } from "~/utils/auth.server";
import { readMailbox } from "~/utils/mailbox.server";
import { Brand } from "~/components/brand";

// Local window onto the fake SMTP server, so invitation and reset links can be followed on a
// machine without real e-mail. Absent unless DUSKLINE_LOCAL; even then only a signed-in admin
// may read it (the messages hold live reset links of every account).
export async function loader({ request }: Route.LoaderArgs) {
  if (!getEnv().DUSKLINE_LOCAL) throw new Response("Not found", { status: 404 });
  await requireRole(request, "admin");
  return { mails: (await readMailbox()).slice(0, 100) };
}

const linkify = (text: string) =>
  text.split(/(https?:\/\/\S+)/g).map((part, i) => (/^https?:\/\//.test(part) ? <a key={i} href={part}>{part}</a> : part));

export default function DevMail({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-3xl p-6">
      <title>Local mailbox · Duskline</title>
      <Brand className="mb-4" />
      <h1>Local mailbox</h1>
      <p className="mb-4 text-sm text-night-400">Messages caught by the local fake SMTP server (local mode only, admins only), newest first.</p>
      {loaderData.mails.length === 0 && <p>No messages yet.</p>}
      <ul className="flex flex-col gap-3">
        {loaderData.mails.map((m) => (
          <li key={m.id} className="card">
            <p className="text-sm text-night-400">
              <span className="figure">{m.receivedAt}</span> · to {m.to.join(", ")}
            </p>
            <h2 className="my-1">{m.subject}</h2>
            <pre className="whitespace-pre-wrap font-sans text-sm">{linkify(m.text)}</pre>
          </li>
        ))}
      </ul>
    </main>
  );
}
