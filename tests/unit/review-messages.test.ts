import { describe, expect, it } from "vitest";
import { reviewMessage } from "../../lib/review/messages";

const base = { crossing: "Otter <Bend>", circuit: "Line 7", verdict: "no-go", by: "Morgan Manager", comment: "Fit solar & re-check", link: "http://app.test/crossings/4" };

describe("review e-mails", () => {
  it("carry crossing, verdict, decision, comment and link in both parts; HTML is escaped", () => {
    const m = reviewMessage({ ...base, kind: "approved", decision: "other", optionName: "Solar markers" });
    expect(m.subject).toBe("Approved: Otter <Bend> (Line 7)");
    expect(m.text).toContain("Verdict: no-go");
    expect(m.text).toContain("Decision: Fit another option: Solar markers");
    expect(m.text).toContain("Comment: Fit solar & re-check");
    expect(m.text).toContain("Open the crossing: http://app.test/crossings/4");
    expect(m.html).toContain("Otter &lt;Bend&gt;");
    expect(m.html).toContain("Fit solar &amp; re-check");
    expect(m.html).toContain('<a href="http://app.test/crossings/4">');
    expect(m.html).not.toContain("<Bend>");
  });
  it("a stale notice says what changed; an unstudied crossing says so", () => {
    const m = reviewMessage({ ...base, kind: "stale", verdict: null, decision: "recommended", optionName: null, staleReasons: ["the span length has changed from 1000 ft to 1200 ft"] });
    expect(m.text).toContain("Verdict: not studied");
    expect(m.text).toContain("What changed: the span length has changed from 1000 ft to 1200 ft");
  });
});

import { describeAuditEntry } from "../../lib/audit/describe";

describe("review moves in the audit log", () => {
  it("read as sentences naming the crossing, decision and comment", () => {
    const base = { who: "Morgan Manager", entity: "crossing", entityId: "4" };
    expect(describeAuditEntry({ ...base, action: "review.approve", detail: { crossing: "Otter Bend", decision: "do-not-proceed", comment: "Too costly." } })).toBe(
      'Morgan Manager approved crossing "Otter Bend" (do not proceed): "Too costly.".',
    );
    expect(describeAuditEntry({ ...base, who: "system", action: "review.stale", detail: { crossing: "Otter Bend", reasons: ["the policy has changed"] } })).toBe(
      'system marked the approval of crossing "Otter Bend" out of date: the policy has changed.',
    );
  });
});
