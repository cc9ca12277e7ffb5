import { Op } from "sequelize";
import { AuditEntry, User } from "../../db/models";
import type { Role } from "../../shared/roles";
import { db } from "../utils/db.server";
import type { SessionUser } from "../utils/session.server";

export interface HomeCard {
  title: string;
  figure: string;
  caption: string;
  link?: { to: string; label: string };
}

type CardSource = (user: SessionUser) => Promise<HomeCard | null>;

// Each role's home page is a list of cards; later features register theirs here.
const CARDS: Partial<Record<Role | "all", CardSource[]>> = {
  admin: [
    async (u) => ({
      title: "People",
      figure: String(await User.count({ where: { organisationId: u.organisationId, active: true } })),
      caption: "active accounts in your organisation",
      link: { to: "/admin/users", label: "Manage people" },
    }),
    async (u) => ({
      title: "Changes this week",
      figure: String(
        await AuditEntry.count({ where: { organisationId: u.organisationId, createdAt: { [Op.gt]: new Date(Date.now() - 7 * 86400_000) } } }),
      ),
      caption: "entries in the audit log",
      link: { to: "/admin/audit", label: "Read the audit log" },
    }),
  ],
  all: [
    async (u) => ({
      title: "Your organisation",
      figure: String(await User.count({ where: { organisationId: u.organisationId, active: true } })),
      caption: `people work in ${u.organisationName}`,
    }),
  ],
};

export async function homeSummary(user: SessionUser): Promise<{ cards: HomeCard[] }> {
  db();
  const sources = [...(CARDS[user.role] ?? []), ...(CARDS.all ?? [])];
  const cards = (await Promise.all(sources.map((s) => s(user)))).filter((c): c is HomeCard => c !== null);
  return { cards };
}
