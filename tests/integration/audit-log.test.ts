// The audit log page and its CSV: plain sentences, filters from the URL, formulas neutralised.
import { describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { signIn } from "../support/http";

describe("audit log", () => {
  it("shows a change as a sentence, filters by action and date, and exports exactly the filtered view", async () => {
    const engineer = await signIn("engineer@example.com");
    const name = `=HYPERLINK("x") audit ${randomUUID().slice(0, 6)}`;
    const created = await engineer.json("/api/v1/circuits", "POST", { name, voltageKv: 115, phases: 3 });
    expect(created.status).toBe(201);

    const admin = await signIn("admin@example.com");
    const today = new Date().toISOString().slice(0, 10);
    const page = await admin.get(`/admin/audit?action=circuit.created&from=${today}&to=${today}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("created circuit &quot;" + name.replace(/"/g, "&quot;"));
    // Only the filtered action: no invitation sentence in the table (the filter list still offers it).
    expect(html).not.toMatch(/invited user &quot;/);

    const csv = await admin.get(`/admin/audit.csv?action=circuit.created&from=${today}&to=${today}`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-type")).toContain("text/csv");
    const text = await csv.text();
    const lines = text.trim().split("\r\n");
    expect(lines[0]).toBe("time (UTC),person,e-mail,what happened,action,record,record id");
    expect(lines.slice(1).every((l) => l.includes(",circuit.created,circuit,"))).toBe(true);
    // The sentence begins with the person's name, not the formula; the name cell itself is quoted text.
    expect(text).toContain(`created circuit ""=HYPERLINK(""x"")`);

    // A day with nothing in it gives only the header.
    const empty = await admin.get("/admin/audit.csv?action=circuit.created&from=2001-01-01&to=2001-01-02");
    expect((await empty.text()).trim().split("\r\n")).toHaveLength(1);
  });

  it("ignores a malformed filter with a message instead of failing", async () => {
    const admin = await signIn("admin@example.com");
    const res = await admin.get("/admin/audit?from=yesterday&person=abc");
    expect(res.status).toBe(200);
    expect(await res.text()).toContain("Some filters were ignored");
  });

  it("is for administrators only", async () => {
    const manager = await signIn("manager@example.com");
    expect((await manager.get("/admin/audit.csv")).status).toBe(403);
  });
});
