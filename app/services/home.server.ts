import { Op } from "sequelize";
import { ApiKey, AuditEntry, Circuit, Crossing, DeviceProfile, LoadProfile, Study, User } from "../../db/models";
import type { QualityReport } from "../../lib/ingest/quality";
import { REVIEW_STATE_LABELS, REVIEW_STATES } from "../../shared/review-schemas";
import { searchAudit } from "./audit.server";
import { portfolio, portfolioRows } from "./portfolio.server";
import { reviewWork } from "./reviews.server";
import { staleReasonsOfStudies } from "./studies.server";
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
  manager: [
    portfolioCard,
    async (u) => {
      const rows = await portfolioRows(u.organisationId);
      const count = (state: string) => rows.filter((r) => r.reviewState === state).length;
      return {
        title: "Reviews",
        figure: `${count("approved")} / ${rows.length}`,
        caption: `crossings approved · ${REVIEW_STATES.filter((s) => s !== "approved").map((s) => `${count(s)} ${REVIEW_STATE_LABELS[s].toLowerCase()}`).join(" · ")} · ${rows.filter((r) => r.reviewStale).length} stale`,
        link: { to: "/portfolio?review=submitted", label: "Submitted crossings" },
      };
    },
  ],
  admin: [
    portfolioCard,
    async (u) => ({
      title: "People",
      figure: String(await User.count({ where: { organisationId: u.organisationId, active: true } })),
      caption: "active accounts in your organisation",
      link: { to: "/admin/users", label: "Manage people" },
    }),
    async (u) => {
      const keys = await ApiKey.findAll({ where: { organisationId: u.organisationId, revokedAt: null }, attributes: ["expiresAt"] });
      return {
        title: "API keys",
        figure: String(keys.filter((k) => !k.expiresAt || k.expiresAt.getTime() > Date.now()).length),
        caption: "keys in use by integrators (not revoked or expired)",
        link: { to: "/admin/api-keys", label: "Manage API keys" },
      };
    },
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

/** A list of things waiting for this person, each a link. */
export interface HomeList {
  id: string;
  title: string;
  empty: string;
  items: { to: string; label: string; note: string }[];
}

type ListSource = (user: SessionUser) => Promise<HomeList>;

/** A profile needs a look when its data covers under 95 % of its period or holds flatlines or zero-current stretches. */
const QUALITY_COVERAGE_FLOOR = 0.95;

const profilesWithQualityProblems: ListSource = async (u) => {
  const profiles = await LoadProfile.findAll({ where: { organisationId: u.organisationId }, attributes: ["id", "name", "quality"], order: [["name", "ASC"]] });
  const items = profiles.flatMap((p) => {
    const q = p.quality as unknown as QualityReport | null;
    if (!q) return [];
    const problems = [
      q.coverage < QUALITY_COVERAGE_FLOOR ? `${(q.coverage * 100).toFixed(1)} % coverage` : null,
      q.flatlines?.length ? `${q.flatlines.length} flatline(s)` : null,
      q.zeroStretches?.length ? `${q.zeroStretches.length} zero-current stretch(es)` : null,
    ].filter((x): x is string => x !== null);
    return problems.length ? [{ to: `/profiles/${p.id}`, label: p.name, note: problems.join(" · ") }] : [];
  });
  return { id: "quality", title: "Load profiles with quality problems", empty: "Every load profile covers at least 95 % of its period without flatlines or zero-current stretches.", items };
};

const studiesToRerun: ListSource = async (u) => {
  const rows = (await portfolioRows(u.organisationId)).filter((r) => r.studyId !== null);
  const studies = await Study.findAll({ where: { organisationId: u.organisationId, id: rows.map((r) => r.studyId!) } });
  const byId = new Map(rows.map((r) => [r.studyId, r]));
  const reasonsById = await staleReasonsOfStudies(u.organisationId, studies);
  const items = studies.flatMap((study) => {
    const reasons = reasonsById.get(study.id) ?? [];
    const row = byId.get(study.id);
    return reasons.length && row ? [{ to: `/studies/${study.id}`, label: `${row.crossing} (${row.circuit})`, note: reasons.join("; ") }] : [];
  });
  return { id: "rerun", title: "Studies to re-run", empty: "Every crossing's latest study still matches its inputs and the policy.", items };
};

const crossingsWithoutRecommendation: ListSource = async (u) => {
  const rows = (await portfolioRows(u.organisationId)).filter((r) => r.recommendedOption === null);
  return {
    id: "no-option",
    title: "Crossings without a recommended option",
    empty: "Every crossing has a recommended lighting option.",
    items: rows.map((r) => ({ to: `/crossings/${r.crossingId}`, label: `${r.crossing} (${r.circuit})`, note: r.verdict ? "no option whose feasibility is go" : "not studied yet" })),
  };
};

const recentChanges: ListSource = async (u) => ({
  id: "recent",
  title: "Recent changes",
  empty: "Nothing has been recorded yet.",
  items: (await searchAudit(u.organisationId, {}, 5)).map((e) => ({ to: "/admin/audit", label: e.sentence, note: e.at.slice(0, 16).replace("T", " ") + " UTC" })),
});

const LISTS: Partial<Record<Role, ListSource[]>> = {
  engineer: [profilesWithQualityProblems, studiesToRerun],
  consultant: [crossingsWithoutRecommendation],
  admin: [recentChanges],
};

export async function homeSummary(user: SessionUser) {
  db();
  const sources = [...(CARDS[user.role] ?? []), ...(CARDS.all ?? [])];
  const [cards, work, lists] = await Promise.all([Promise.all(sources.map((s) => s(user))), reviewWork(user), Promise.all((LISTS[user.role] ?? []).map((l) => l(user)))]);
  return { cards: cards.filter((c): c is HomeCard => c !== null), work, lists };
}
