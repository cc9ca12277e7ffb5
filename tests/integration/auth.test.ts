import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { Session, User } from "../../db/models";
import { closeDb } from "../../db/index";
import { hashPassword } from "../../lib/passwords";
import { client, signIn } from "../support/http";
import { testDb } from "../support/db";
import { firstLink, waitForMail } from "../support/mail";

beforeAll(() => {
  testDb();
});
afterAll(async () => {
  await closeDb();
});

async function makeUser(role: User["role"] = "engineer", password = "a-good-long-password") {
  const admin = await User.findOne({ where: { email: "admin@example.com" } });
  return User.create({
    organisationId: admin!.organisationId,
    email: `t-${randomUUID().slice(0, 8)}@example.com`,
    name: "Test Person",
    role,
    passwordHash: await hashPassword(password),
  });
}

describe("sign-in", () => {
  it("succeeds with 302 and a session cookie, and the home page then shows the user", async () => {
    const c = client();
    const res = await c.post("/login", { email: "engineer@example.com", password: "duskline-demo" });
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toBe("/");
    expect(res.headers.get("set-cookie")).toMatch(/^__duskline=/);
    expect(res.headers.get("set-cookie")).toMatch(/HttpOnly/i);
    const home = await c.get("/");
    expect(home.status).toBe(200);
    expect(await home.text()).toContain("Ellis Engineer");
  });

  it("answers 401 with a message on a wrong password", async () => {
    const res = await client().post("/login", { email: "engineer@example.com", password: "not-the-password" });
    expect(res.status).toBe(401);
    expect(await res.text()).toContain("E-mail or password is not right.");
  });

  it("redirects to /login when signed out", async () => {
    const res = await client().get("/");
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toBe("/login");
  });

  it("refuses a locked account even with the right password", async () => {
    const user = await makeUser();
    const c = client();
    for (let i = 0; i < 5; i++) {
      const res = await c.post("/login", { email: user.email, password: "wrong-password-xx" });
      expect(res.status).toBe(401);
    }
    // A different address: the lock is per account, not only per address.
    const res = await client().post("/login", { email: user.email, password: "a-good-long-password" });
    expect(res.status).toBe(429);
    expect(await res.text()).toContain("locked after 5 failed sign-ins");
  });

  it("rotates the session id at sign-in", async () => {
    const c = await signIn("consultant@example.com");
    const first = c.cookie;
    await c.post("/login", { email: "consultant@example.com", password: "duskline-demo" });
    expect(c.cookie).not.toBe(first);
    // The earlier session row is gone: the old cookie no longer works.
    const stale = await client(first).get("/");
    expect(stale.status).toBe(302);
  });
});

describe("roles", () => {
  it("refuses an engineer on /admin/users with a 403 page", async () => {
    const c = await signIn("engineer@example.com");
    const res = await c.get("/admin/users");
    expect(res.status).toBe(403);
    expect(await res.text()).toContain("Not allowed");
  });

  it("lets the admin see the people list", async () => {
    const c = await signIn("admin@example.com");
    const res = await c.get("/admin/users");
    expect(res.status).toBe(200);
    const html = await res.text();
    for (const email of ["engineer@example.com", "consultant@example.com", "manager@example.com"]) expect(html).toContain(email);
  });

  it("unknown addresses give a friendly 404", async () => {
    const res = await client().get("/no/such/page");
    expect(res.status).toBe(404);
    expect(await res.text()).toContain("Page not found");
  });
});

describe("sign-out", () => {
  it("deletes the session row so the old cookie stops working", async () => {
    const c = await signIn("manager@example.com");
    const cookie = c.cookie;
    const before = await Session.count();
    const res = await c.post("/logout", {});
    expect(res.status).toBe(302);
    expect(await Session.count()).toBe(before - 1);
    const again = await client(cookie).get("/");
    expect(again.status).toBe(302);
    expect(again.headers.get("location")).toBe("/login");
  });

  it("deactivating a user ends their sessions", async () => {
    const user = await makeUser("consultant");
    const theirs = await signIn(user.email, "a-good-long-password");
    expect((await theirs.get("/")).status).toBe(200);
    const admin = await signIn("admin@example.com");
    const res = await admin.post("/admin/users", { intent: "deactivate", userId: String(user.id) });
    expect(res.status).toBe(200);
    expect((await theirs.get("/")).status).toBe(302);
    expect(await Session.count({ where: { userId: user.id } })).toBe(0);
  });
});

describe("invitation and password reset", () => {
  it("the invitation e-mail's link sets a password that then signs in", async () => {
    const email = `invitee-${randomUUID().slice(0, 8)}@example.com`;
    const admin = await signIn("admin@example.com");
    const res = await admin.post("/admin/users", { intent: "invite", email, name: "Ina Invitee", role: "manager" });
    expect(res.status).toBe(200);
    const mail = await waitForMail(email, "invited");
    const link = firstLink(mail.text);
    expect(link.pathname).toMatch(/^\/invite\//);

    const page = await client().get(link.pathname);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(email);

    const tooShort = await client().post(link.pathname, { password: "short", confirm: "short" });
    expect(tooShort.status).toBe(400);
    expect(await tooShort.text()).toContain("Use at least 12 characters.");

    const set = await client().post(link.pathname, { password: "a-new-password-1", confirm: "a-new-password-1" });
    expect(set.status).toBe(302);
    const c = await signIn(email, "a-new-password-1");
    expect(await (await c.get("/")).text()).toContain("Ina Invitee");

    // The link is single-use.
    expect((await client().get(link.pathname)).status).toBe(410);
    const user = await User.findOne({ where: { email } });
    expect(user!.role).toBe("manager");
  });

  it("an invitation to an existing address is refused beside the field", async () => {
    const admin = await signIn("admin@example.com");
    const res = await admin.post("/admin/users", { intent: "invite", email: "engineer@example.com", name: "Dup", role: "engineer" });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain("engineer@example.com already has an account.");
  });

  it("a password reset e-mail sets a new password", async () => {
    const user = await makeUser();
    const res = await client().post("/forgot-password", { email: user.email });
    expect(res.status).toBe(200);
    const link = firstLink((await waitForMail(user.email, "Reset")).text);
    const set = await client().post(link.pathname, { password: "brand-new-pass-1", confirm: "brand-new-pass-1" });
    expect(set.status).toBe(302);
    await signIn(user.email, "brand-new-pass-1");
    const old = await client().post("/login", { email: user.email, password: "a-good-long-password" });
    expect(old.status).toBe(401);
  });
});
