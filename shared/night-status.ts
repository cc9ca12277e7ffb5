// Words, marks and colours of the night-by-night calendar's statuses: one home for the study page,
// the printable report and the PDF. Each status has its own mark as well as its colour, so the
// calendar never relies on colour alone.
import type { NightStatus } from "./study-schemas";

export const NIGHT_STATUS_STYLE: Record<NightStatus, { label: string; mark: string; colour: string; text: string }> = {
  lit: { label: "Lit all night", mark: "", colour: "#3fbf8a", text: "#07301f" },
  partly: { label: "Partly dark", mark: "◐", colour: "#e8c547", text: "#3a2e05" },
  dark: { label: "Dark", mark: "●", colour: "#e5646e", text: "#3b0a0e" },
  unknown: { label: "Unknown (half or more without data)", mark: "?", colour: "#5b6688", text: "#eef0f8" },
  none: { label: "No required time", mark: "–", colour: "transparent", text: "#8d97b8" },
};

/**
 * The calendar cells' colours and marks as CSS rules by `data-status`, drawn once per page instead
 * of a style and a mark on each of a year's ~365 cells.
 */
export const NIGHT_CELL_CSS = (Object.entries(NIGHT_STATUS_STYLE) as [NightStatus, (typeof NIGHT_STATUS_STYLE)[NightStatus]][])
  .map(([status, s]) => `.night-cell[data-status=${status}]{background:${s.colour};color:${s.text}}` + (s.mark ? `.night-cell[data-status=${status}]::after{content:"${s.mark}"}` : ""))
  .join("");

/** "42 min dark of 13 h 5 min required; 0 min unknown" for a cell's hover and label. */
export function describeNight(n: { date: string; status: NightStatus; requiredMinutes: number; darkMinutes: number; unknownMinutes: number }): string {
  const label = NIGHT_STATUS_STYLE[n.status].label.toLowerCase();
  if (n.status === "none") return `Night of ${n.date}: no required time`;
  return `Night of ${n.date}: ${label}; ${minutesText(n.darkMinutes)} dark of ${minutesText(n.requiredMinutes)} required, ${minutesText(n.unknownMinutes)} unknown`;
}

function minutesText(m: number): string {
  const whole = Math.round(m);
  if (whole < 60) return `${whole} min`;
  return `${Math.floor(whole / 60)} h ${whole % 60} min`;
}
