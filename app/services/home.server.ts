import { Op } from "sequelize";
import { AuditEntry, Circuit, Crossing, DeviceProfile, LoadProfile, Study, User } from "../../db/models";
import { portfolio } from "./portfolio.server";
import { reviewWork } from "./reviews.server";
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
const portfolioCard: CardSource = async (u) => {
  const { counts } = await portfolio(u.organisationId);
  return {
    title: "Go / no-go",
    figure: `${counts.go} / ${counts["no-go"]}`,
    caption: `crossings go / no-go · ${counts.marginal} marginal · ${counts["insufficient-data"]} insufficient data · ${counts["not-studied"]} not studied`,
    link: { to: "/portfolio", label: "Open the portfolio" },
  };
};

const CARDS: Partial<Record<Role | "all", CardSource[]>> = {
  engineer: [
    async (u) => ({
      title: "Circuits",
      figure: String(await Circuit.count({ where: { organisationId: u.organisationId } })),
      caption: `with ${await LoadProfile.count({ where: { organisationId: u.organisationId } })} load profiles uploaded`,
      link: { to: "/circuits", label: "Circuits and uploads" },
    }),
    async (u) => ({
      title: "Studies this month",
      figure: String(await Study.count({ where: { organisationId: u.organisationId, createdAt: { [Op.gt]: new Date(Date.now() - 30 * 86400_000) } } })),
      caption: "feasibility runs in the last 30 days",
      link: { to: "/portfolio", label: "Latest verdicts" },
    }),
    async (u) => ({
      title: "Device profiles",
      figure: String(await DeviceProfile.count({ where: { organisationId: u.organisationId, retired: false } })),
      caption: "in use for new studies",
      link: { to: "/devices", label: "Device profiles" },
    }),
  ],
  consultant: [
    async (u) => ({
      title: "Crossings",
      figure: String(await Crossing.count({ where: { organisationId: u.organisationId } })),
      caption: "spans to mark and light",
      link: { to: "/circuits", label: "Pick a crossing" },
    }),
    portfolioCard,
  ],
  manager: [portfolioCard],
  admin: [
    portfolioCard,
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
  all: [],
};

export async function homeSummary(user: SessionUser) {
  db();
  const sources = [...(CARDS[user.role] ?? []), ...(CARDS.all ?? [])];
  const [cards, work] = await Promise.all([Promise.all(sources.map((s) => s(user))), reviewWork(user)]);
  return { cards: cards.filter((c): c is HomeCard => c !== null), work };
}
