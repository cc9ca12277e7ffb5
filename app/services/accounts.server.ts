import { createHash, randomBytes } from "node:crypto";
import { Op } from "sequelize";
import { AccountToken, User, type AccountTokenKind } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { RESET_LIMITS } from "../../lib/sign-in-throttle";
import type { Role } from "../../shared/roles";
import { db } from "../utils/db.server";
import { sendMail } from "../utils/email.server";
import { appUrl } from "../utils/env.server";
import { endSessionsOfUser } from "../utils/session.server";
import { audit, type Actor } from "./audit.server";
import { hitRateLimit } from "./rate-limits.server";

// Links in mails are built from APP_URL only (appUrl()), never from the request's Host header.
const TOKEN_HOURS: Record<AccountTokenKind, number> = { invite: 72, reset: 2 };

export class AccountError extends Error {
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

async function issueToken(userId: number, kind: AccountTokenKind): Promise<string> {
  const token = randomBytes(24).toString("base64url");
  // A new link replaces any earlier unused one of the same kind.
  await db().transaction(async (transaction) => {
    await AccountToken.destroy({ where: { userId, kind, usedAt: null }, transaction });
    await AccountToken.create(
      { userId, kind, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + TOKEN_HOURS[kind] * 3600_000), usedAt: null },
      { transaction },
    );
  });
  return token;
}

export async function listUsers(organisationId: number) {
  db();
  return User.findAll({ where: { organisationId }, order: [["name", "ASC"]] });
}

export async function inviteUser(actor: Actor & { name: string }, input: { email: string; name: string; role: Role }) {
  const sequelize = db();
  if (await User.findOne({ where: { email: input.email } })) {
    throw new AccountError(`${input.email} already has an account.`, "email");
  }
  const user = await sequelize.transaction(async (transaction) => {
    const u = await User.create({ ...input, organisationId: actor.organisationId, passwordHash: null }, { transaction });
    await audit(actor, "user.invited", "user", u.id, { email: input.email, role: input.role }, transaction);
    return u;
  });
  const token = await issueToken(user.id, "invite");
  await sendMail({
    to: user.email,
    subject: "You are invited to Duskline",
    text:
      `${actor.name} invited you to Duskline as ${input.role}.\n\n` +
      `Set your password here (the link expires in ${TOKEN_HOURS.invite} hours):\n${appUrl()}/invite/${token}\n`,
  });
  return user;
}

export async function changeRole(actor: Actor, userId: number, role: Role) {
  const sequelize = db();
  const user = await User.findOne({ where: { id: userId, organisationId: actor.organisationId } });
  if (!user) throw new AccountError("No such user in your organisation.");
  if (user.id === actor.id && role !== "admin") throw new AccountError("You cannot remove your own admin role.", "role");
  await sequelize.transaction(async (transaction) => {
    const from = user.role;
    await user.update({ role }, { transaction });
    await audit(actor, "user.role-changed", "user", user.id, { from, to: role }, transaction);
  });
}

export async function setActive(actor: Actor, userId: number, active: boolean) {
  const sequelize = db();
  const user = await User.findOne({ where: { id: userId, organisationId: actor.organisationId } });
  if (!user) throw new AccountError("No such user in your organisation.");
  if (user.id === actor.id) throw new AccountError("You cannot deactivate yourself.");
  await sequelize.transaction(async (transaction) => {
    await user.update({ active }, { transaction });
    await audit(actor, active ? "user.reactivated" : "user.deactivated", "user", user.id, null, transaction);
  });
  if (!active) await endSessionsOfUser(user.id);
}

/** Always behaves the same whether or not the address exists, so it reveals no accounts. */
export async function requestPasswordReset(email: string): Promise<void> {
  db();
  const user = await User.findOne({ where: { email, active: true } });
  if (!user) return;
  const token = await issueToken(user.id, "reset");
  await sendMail({
    to: user.email,
    subject: "Reset your Duskline password",
    text: `Someone asked to reset the password of ${user.email}.\n\nChoose a new password here (the link expires in ${TOKEN_HOURS.reset} hours):\n${appUrl()}/reset/${token}\n\nIf it was not you, ignore this message.`,
  });
  await audit({ id: user.id, organisationId: user.organisationId }, "user.reset-requested", "user", user.id);
}

/**
 * The forgot-password request: limited per e-mail and per client address (counted in MariaDB),
 * then the reset is prepared after the answer is sent, so the answer takes the same time whether
 * or not the address has an account.
 */
export async function requestPasswordResetLimited(email: string, address: string | null) {
  const decision = await hitRateLimit(
    "password-reset",
    [
      { subject: `email:${email}`, limit: RESET_LIMITS.perEmail },
      { subject: address === null ? null : `address:${address}`, limit: RESET_LIMITS.perAddress },
    ],
    RESET_LIMITS.windowMinutes,
  );
  if (decision.allowed) {
    void requestPasswordReset(email).catch((error) => console.error("password reset for a requested address failed:", error));
  }
  return decision;
}

/** The user a valid, unused, unexpired link belongs to, or null. */
export async function findTokenUser(kind: AccountTokenKind, token: string) {
  db();
  const row = await AccountToken.findOne({
    where: { kind, tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } },
  });
  if (!row) return null;
  const user = await User.findByPk(row.userId);
  return user && user.active ? { user, tokenId: row.id } : null;
}

export async function setPasswordWithToken(kind: AccountTokenKind, token: string, password: string) {
  const sequelize = db();
  const found = await findTokenUser(kind, token);
  if (!found) throw new AccountError("This link is no longer valid. Ask for a new one.");
  const passwordHash = await hashPassword(password);
  await sequelize.transaction(async (transaction) => {
    // Consumed atomically: of several concurrent uses, only the one whose UPDATE still finds the
    // token unused goes on; the others roll back and see the link as used.
    const [consumed] = await AccountToken.update(
      { usedAt: new Date() },
      { where: { id: found.tokenId, usedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction },
    );
    if (consumed !== 1) throw new AccountError("This link is no longer valid. Ask for a new one.");
    await found.user.update({ passwordHash }, { transaction });
    await audit({ id: found.user.id, organisationId: found.user.organisationId }, kind === "invite" ? "user.invitation-accepted" : "user.password-reset", "user", found.user.id, null, transaction);
  });
  // A reset ends every existing session of the account, and its owner hears of it.
  await endSessionsOfUser(found.user.id);
  if (kind === "reset") {
    await sendMail({
      to: found.user.email,
      subject: "Your Duskline password was changed",
      text: `The password of ${found.user.email} was changed through a reset link, and every session of the account was signed out.\n\nIf it was not you, ask your administrator to deactivate the account at once.\n`,
    }).catch((error) => console.error("password-changed notice could not be sent:", error));
  }
  return found.user;
}
