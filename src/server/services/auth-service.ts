import { subMinutes } from "date-fns";
import { db } from "../../db/client.ts";
import { lucia } from "../auth/lucia.ts";
import { hashPassword, verifyDecoy, verifyPassword } from "../auth/passwords.ts";
import { HttpError, badRequest } from "../errors.ts";
import { hashToken, newToken } from "../tokens.ts";
import { enqueueMail, deliverSoon } from "../mail/outbox.ts";
import { appUrl } from "../env.ts";
import { writeAudit } from "./audit.ts";

/** Failed sign-ins allowed in the window before the account or the address must wait. */
export const RATE_LIMIT = { windowMinutes: 15, perAccount: 5, perAddress: 20 } as const;
export const RESET_TOKEN_MINUTES = 30;

export const SIGN_IN_FAILED = "That e-mail and password do not match an account.";

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

async function failuresSince(scope: "account" | "address", subject: string, since: Date): Promise<number> {
  const row = await db()("sign_in_attempts")
    .where({ scope, subject })
    .andWhere("attempted_at", ">", since)
    .count<{ n: number }[]>({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}

export interface SignInResult {
  sessionId: string;
  userId: string;
}

export async function signIn(input: { email: string; password: string; address: string; now: Date }): Promise<SignInResult> {
  const email = normaliseEmail(input.email);
  const since = subMinutes(input.now, RATE_LIMIT.windowMinutes);
  const [byAccount, byAddress] = await Promise.all([
    failuresSince("account", email, since),
    failuresSince("address", input.address, since),
  ]);
  if (byAccount >= RATE_LIMIT.perAccount || byAddress >= RATE_LIMIT.perAddress) {
    throw new HttpError(
      429,
      "rate_limited",
      `Too many failed sign-ins. Wait ${RATE_LIMIT.windowMinutes} minutes, or reset your password.`,
      undefined,
      { "retry-after": String(RATE_LIMIT.windowMinutes * 60) },
    );
  }
  const user = await db()("users").where({ email }).first("id", "password_hash");
  const ok = user ? await verifyPassword(user.password_hash, input.password) : (await verifyDecoy(input.password), false);
  if (!ok || !user) {
    await db()("sign_in_attempts").insert([
      { scope: "account", subject: email, attempted_at: input.now },
      { scope: "address", subject: input.address, attempted_at: input.now },
    ]);
    throw new HttpError(401, "sign_in_failed", SIGN_IN_FAILED);
  }
  await db()("sign_in_attempts").where({ scope: "account", subject: email }).delete();
  // A new session id at every sign-in: a session id planted before sign-in is never promoted.
  const session = await lucia.createSession(user.id, {});
  return { sessionId: session.id, userId: user.id };
}

export async function requestPasswordReset(emailInput: string, now: Date): Promise<void> {
  const email = normaliseEmail(emailInput);
  const user = await db()("users").where({ email }).first("id", "name");
  if (!user) return; // the same answer either way: nobody learns which e-mails have accounts
  const { token, tokenHash } = newToken();
  const link = `${appUrl()}/reset/${token}`;
  const key = `reset:${tokenHash}`;
  await db().transaction(async (trx) => {
    await trx("password_resets").insert({
      user_id: user.id,
      token_hash: tokenHash,
      expires_at: new Date(now.getTime() + RESET_TOKEN_MINUTES * 60_000),
    });
    await enqueueMail(
      trx,
      {
        dedupeKey: key,
        organisationId: null,
        to: email,
        subject: "Reset your Ringland password",
        text: `Hello ${user.name},\n\nSomeone asked to reset the password of your Ringland account. If it was you, open this link within ${RESET_TOKEN_MINUTES} minutes:\n\n${link}\n\nThe link works once. If it was not you, ignore this mail; your password stays as it is.\n`,
        html: `<p>Hello ${escapeHtml(user.name)},</p><p>Someone asked to reset the password of your Ringland account. If it was you, open this link within ${RESET_TOKEN_MINUTES} minutes:</p><p><a href="${link}">${link}</a></p><p>The link works once. If it was not you, ignore this mail; your password stays as it is.</p>`,
      },
      now,
    );
  });
  await deliverSoon([key]);
}

export async function resetPassword(token: string, password: string, now: Date): Promise<void> {
  const tokenHash = hashToken(token);
  const passwordHash = await hashPassword(password);
  await db().transaction(async (trx) => {
    const row = await trx("password_resets").where({ token_hash: tokenHash }).forUpdate().first();
    if (!row || row.used_at || new Date(row.expires_at) <= now) {
      throw badRequest("This reset link has expired or was already used. Ask for a new one.", { token: "expired or used" });
    }
    await trx("password_resets").where({ id: row.id }).update({ used_at: now });
    await trx("users").where({ id: row.user_id }).update({ password_hash: passwordHash, updated_at: now });
    await trx("sessions").where({ user_id: row.user_id }).delete();
    await writeAudit(trx, {
      organisationId: null,
      actorUserId: row.user_id,
      action: "user.password_reset",
      entity: "user",
      entityId: row.user_id,
    });
  });
}

export async function switchOrganisation(userId: string, organisationId: number): Promise<void> {
  const member = await db()("memberships").where({ user_id: userId, organisation_id: organisationId }).first("id");
  if (!member) throw new HttpError(404, "not_found", "You are not a member of that organisation.");
  await db()("users").where({ id: userId }).update({ last_org_id: organisationId });
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}
