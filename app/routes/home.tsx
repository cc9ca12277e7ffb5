import { Link } from "react-router";
import type { Route } from "./+types/home";
import { requireUser } from "~/utils/auth.server";
import { homeSummary } from "~/services/home.server";
import { ROLE_LABELS, type Role } from "../../shared/roles";
import { formatUtc } from "../../shared/format";
import type { ReviewWorkItem } from "~/services/reviews.server";
import type { HomeList } from "~/services/home.server";

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  return { role: user.role, name: user.name, summary: await homeSummary(user) };
}

const INTRO: Record<Role, string> = {
  engineer: "Bring in current history for your circuits, check its quality, and run feasibility studies per crossing.",
  consultant: "Lay out markers per span, compare lighting options on feasibility and life-cycle cost, and recommend one.",
  manager: "Follow the go/no-go picture across circuits and crossings, and open any study behind it.",
  admin: "Manage the people in your organisation, their roles, and the organisation's defaults.",
};

export default function Home({ loaderData }: Route.ComponentProps) {
  const { role, name, summary } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <title>Home · Duskline</title>
      <div>
        <p className="text-sm text-amber-glow">{ROLE_LABELS[role]}</p>
        <h1>Good to see you, {name.split(" ")[0]}</h1>
        <p className="mt-2 max-w-2xl text-night-200">{INTRO[role]}</p>
      </div>
      {role === "manager" && (
        <>
          <WorkList id="awaiting" title="Awaiting your decision" empty="Nothing is waiting for your sign-off." items={summary.work.awaiting} />
          <WorkList id="stale" title="Stale approvals" empty="Every approval still matches its crossing." items={summary.work.stale} />
        </>
      )}
      {(role === "engineer" || role === "consultant") && (
        <WorkList id="returned" title="Returned to you" empty="Nothing has been returned to you." items={summary.work.returned} />
      )}
      {summary.lists.map((list) => (
        <LinkList key={list.id} list={list} />
      ))}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        {summary.cards.map((card) => (
          <section key={card.title} className="card" aria-labelledby={`card-${card.title}`}>
            <h2 id={`card-${card.title}`}>{card.title}</h2>
            <p className="figure mt-2 text-3xl text-amber-glow">{card.figure}</p>
            <p className="mt-1 text-sm text-night-400">{card.caption}</p>
            {card.link && (
              <Link to={card.link.to} className="mt-3 inline-block text-sm">
                {card.link.label} →
              </Link>
            )}
          </section>
        ))}
      </div>
    </div>
  );
}

/** One list of crossings waiting for this person, each a link to its crossing page. */
function WorkList({ id, title, empty, items }: { id: string; title: string; empty: string; items: ReviewWorkItem[] }) {
  return (
    <section className="card" aria-labelledby={`work-${id}`} data-testid={`work-${id}`}>
      <h2 id={`work-${id}`}>
        {title} <span className="figure text-amber-glow">{items.length}</span>
      </h2>
      {items.length === 0 ? (
        <p className="mt-2 text-sm text-night-400">{empty}</p>
      ) : (
        <ul className="mt-2 flex flex-col gap-2">
          {items.map((item) => (
            <li key={item.crossingId}>
              <Link to={`/crossings/${item.crossingId}`}>
                {item.crossing} <span className="text-night-400">({item.circuit})</span>
              </Link>
              <span className="text-sm text-night-400">
                {item.by ? ` · ${item.state === "approved" ? "approved" : "submitted"} by ${item.by}` : ""}
                {item.at ? ` · ${formatUtc(item.at)}` : ""}
              </span>
              {item.staleReasons.length > 0 && <p className="text-sm text-verdict-marginal">{item.staleReasons.join("; ")}</p>}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

/** A role's list of things to look at (profiles, studies, crossings, changes), each a link. */
function LinkList({ list }: { list: HomeList }) {
  return (
    <section className="card" aria-labelledby={`list-${list.id}`} data-testid={`list-${list.id}`}>
      <h2 id={`list-${list.id}`}>
        {list.title} <span className="figure text-amber-glow">{list.items.length}</span>
      </h2>
      {list.items.length === 0 ? (
        <p className="mt-2 text-sm text-night-400">{list.empty}</p>
      ) : (
        <ul className="mt-2 flex flex-col gap-2">
          {list.items.slice(0, 20).map((item, i) => (
            <li key={`${item.to}-${i}`}>
              <Link to={item.to}>{item.label}</Link>
              <span className="text-sm text-night-400"> · {item.note}</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
