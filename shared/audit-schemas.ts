// The audit log's filters, read from the URL so a filtered view can be shared and exported.
import { z } from "zod";

const optionalText = z.string().trim().max(100).optional().transform((v) => (v ? v : undefined));
const optionalDay = z
  .string()
  .trim()
  .optional()
  .transform((v) => (v ? v : undefined))
  .pipe(z.iso.date({ error: "Use a date like 2026-12-03." }).optional());

export const auditFiltersSchema = z.object({
  person: z.coerce.number().int().positive().optional().catch(undefined),
  entity: optionalText,
  action: optionalText,
  from: optionalDay,
  to: optionalDay,
});
export type AuditFilters = Partial<z.infer<typeof auditFiltersSchema>>;

/** Filters from URL search params; a malformed value is dropped with a message rather than failing the page. */
export function parseAuditFilters(search: URLSearchParams): { filters: AuditFilters; problems: string[] } {
  const raw = Object.fromEntries(search);
  const result = auditFiltersSchema.safeParse(raw);
  if (result.success) return { filters: result.data, problems: [] };
  const problems = result.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
  const bad = new Set(result.error.issues.map((i) => String(i.path[0])));
  const kept = Object.fromEntries(Object.entries(raw).filter(([k]) => !bad.has(k)));
  return { filters: auditFiltersSchema.parse(kept), problems };
}
