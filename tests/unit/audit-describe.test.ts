import { describe, expect, it } from "vitest";
import { describeAuditEntry } from "../../lib/audit/describe";

const entry = (action: string, entity: string, detail: Record<string, unknown> | null = null, entityId: string | null = "7") => ({ who: "Erin Engineer", action, entity, entityId, detail });

describe("audit entries in plain words", () => {
  it.each([
    [entry("profile.uploaded", "load-profile", { name: "Winter 2025", samples: 41760 }), 'Erin Engineer uploaded load profile "Winter 2025" (41,760 samples).'],
    [entry("profile.appended", "load-profile", { added: 44640, replaced: 0 }), "Erin Engineer appended data to load profile 7 (44,640 samples)."],
    [entry("profile.replaced", "load-profile", { fromVersion: 2, toVersion: 3 }), "Erin Engineer replaced the data of load profile 7 (data version 3)."],
    [entry("study.run", "study", { crossingId: 3, verdict: "go" }), "Erin Engineer ran study 7 on crossing 3: verdict go."],
    [entry("user.role-changed", "user", { from: "engineer", to: "manager" }), "Erin Engineer changed the role of user 7 from engineer to manager."],
    [entry("user.invited", "user", { email: "new@example.com", role: "consultant" }), 'Erin Engineer invited user "new@example.com" as consultant.'],
    [entry("api-key.revoked", "api-key", { name: "Historian bridge", prefix: "dsk_1234" }), 'Erin Engineer revoked API key "Historian bridge".'],
    [entry("api-key.taken-over", "api-key", { name: "Historian bridge", prefix: "dsk_1234" }), 'Erin Engineer took over API key "Historian bridge" (its creator had been deactivated).'],
    [entry("crossing.details-updated", "crossing", { spanLength: 300 }), "Erin Engineer changed the span and marking details of crossing 7."],
    [entry("user.reset-requested", "user"), "Erin Engineer asked for a password reset."],
  ])("%o", (facts, sentence) => {
    expect(describeAuditEntry(facts)).toBe(sentence);
  });

  it("an action it does not know still reads as a sentence, never raw JSON", () => {
    const sentence = describeAuditEntry(entry("review.something-new", "crossing", { note: "x" }));
    expect(sentence).toBe("Erin Engineer something new — crossing 7.");
    expect(sentence).not.toContain("{");
  });
});
