import { Link } from "react-router";
import type { Route } from "./+types/home";
import { requireUser } from "~/utils/auth.server";
import { homeSummary } from "~/services/home.server";
import { ROLE_LABELS, type Role } from "../../shared/roles";

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
