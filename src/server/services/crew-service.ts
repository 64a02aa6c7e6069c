import type { Knex } from "knex";
import { db } from "../../db/client.ts";
import { ROLE_LABELS, type Role } from "../../lib/permissions.ts";
import { appUrl } from "../env.ts";
import { HttpError, badRequest, conflict, notFound } from "../errors.ts";
import { hashPassword } from "../auth/passwords.ts";
import { enqueueMail, deliverSoon } from "../mail/outbox.ts";
import { hashToken, newId, newToken } from "../tokens.ts";
import { writeAudit } from "./audit.ts";
import { escapeHtml, normaliseEmail } from "./auth-service.ts";

export const INVITATION_DAYS = 7;

export interface Member {
  userId: string;
  name: string;
  email: string;
  role: Role;
  since: string;
}

export async function listMembers(organisationId: number): Promise<Member[]> {
  const rows = await db()("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.organisation_id", organisationId)
    .orderByRaw("FIELD(m.role, 'owner','manager','crew_chief','mechanic','viewer')")
    .orderBy("u.name")
    .select("u.id", "u.name", "u.email", "m.role", "m.created_at");
  return rows.map((r) => ({ userId: r.id, name: r.name, email: r.email, role: r.role, since: new Date(r.created_at).toISOString() }));
}

export interface PendingInvitation {
  id: number;
  email: string;
  role: Role;
  expiresAt: string;
}

export async function listPendingInvitations(organisationId: number, now: Date): Promise<PendingInvitation[]> {
  const rows = await db()("invitations")
    .where({ organisation_id: organisationId })
    .whereNull("accepted_at")
    .whereNull("revoked_at")
    .andWhere("expires_at", ">", now)
    .orderBy("created_at", "desc");
  return rows.map((r) => ({ id: Number(r.id), email: r.email, role: r.role, expiresAt: new Date(r.expires_at).toISOString() }));
}

export async function inviteMember(input: {
  organisationId: number;
  organisationName: string;
  actorUserId: string;
  actorName: string;
  email: string;
  role: Role;
  now: Date;
}): Promise<{ invitationId: number }> {
  const email = normaliseEmail(input.email);
  const { token, tokenHash } = newToken();
  const key = `invite:${tokenHash}`;
  const link = `${appUrl()}/invite/${token}`;
  const invitationId = await db().transaction(async (trx) => {
    const existing = await trx("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where({ "m.organisation_id": input.organisationId, "u.email": email })
      .first("m.id");
    if (existing) throw conflict("That person is already a member of this organisation.", { email: "already a member" });
    // A newer invitation replaces an older pending one for the same address.
    await trx("invitations")
      .where({ organisation_id: input.organisationId, email })
      .whereNull("accepted_at")
      .whereNull("revoked_at")
      .update({ revoked_at: input.now });
    const [id] = await trx("invitations").insert({
      organisation_id: input.organisationId,
      email,
      role: input.role,
      token_hash: tokenHash,
      invited_by: input.actorUserId,
      expires_at: new Date(input.now.getTime() + INVITATION_DAYS * 86_400_000),
    });
    const role = ROLE_LABELS[input.role].toLowerCase();
    await enqueueMail(
      trx,
      {
        dedupeKey: key,
        organisationId: input.organisationId,
        to: email,
        subject: `${input.actorName} invites you to ${input.organisationName} on Ringland`,
        text: `${input.actorName} invites you to join ${input.organisationName} on Ringland as ${role}.\n\nAccept within ${INVITATION_DAYS} days:\n${link}\n`,
        html: `<p>${escapeHtml(input.actorName)} invites you to join <strong>${escapeHtml(input.organisationName)}</strong> on Ringland as ${role}.</p><p><a href="${link}">Accept the invitation</a> within ${INVITATION_DAYS} days.</p>`,
      },
      input.now,
    );
    await writeAudit(trx, {
      organisationId: input.organisationId,
      actorUserId: input.actorUserId,
      action: "member.invited",
      entity: "invitation",
      entityId: id,
      details: { email, role: input.role },
    });
    return Number(id);
  });
  await deliverSoon([key]);
  return { invitationId };
}

async function findLiveInvitation(trx: Knex, token: string, now: Date) {
  const row = await trx("invitations as i")
    .join("organisations as o", "o.id", "i.organisation_id")
    .where("i.token_hash", hashToken(token))
    .forUpdate()
    .first("i.*", "o.name as organisation_name");
  if (!row || row.accepted_at || row.revoked_at || new Date(row.expires_at) <= now) return null;
  return row;
}

export async function describeInvitation(
  token: string,
  now: Date,
): Promise<{ email: string; organisationName: string; role: Role; hasAccount: boolean } | null> {
  const row = await findLiveInvitation(db(), token, now);
  if (!row) return null;
  const user = await db()("users").where({ email: row.email }).first("id", "password_hash");
  return { email: row.email, organisationName: row.organisation_name, role: row.role, hasAccount: Boolean(user?.password_hash) };
}

/** Accepting creates the account when needed (setting its password) and the membership, in one transaction. */
export async function acceptInvitation(input: { token: string; name: string; password: string; now: Date }): Promise<{ userId: string }> {
  const passwordHash = await hashPassword(input.password);
  return db().transaction(async (trx) => {
    const inv = await findLiveInvitation(trx, input.token, input.now);
    if (!inv) throw badRequest("This invitation has expired or was already used. Ask for a new one.", { token: "expired or used" });
    let user = await trx("users").where({ email: inv.email }).first("id", "password_hash");
    if (user?.password_hash) {
      throw conflict("An account with this e-mail exists already: sign in first, then open the link again.", { email: "has an account" });
    }
    let userId = user?.id as string | undefined;
    if (!userId) {
      userId = newId();
      await trx("users").insert({ id: userId, email: inv.email, name: input.name, password_hash: passwordHash, last_org_id: inv.organisation_id });
    } else {
      await trx("users").where({ id: userId }).update({ name: input.name, password_hash: passwordHash, last_org_id: inv.organisation_id });
    }
    await trx("memberships").insert({ organisation_id: inv.organisation_id, user_id: userId, role: inv.role }).onConflict(["organisation_id", "user_id"]).ignore();
    await trx("invitations").where({ id: inv.id }).update({ accepted_at: input.now });
    await writeAudit(trx, {
      organisationId: inv.organisation_id,
      actorUserId: userId,
      action: "member.joined",
      entity: "membership",
      entityId: userId,
      details: { role: inv.role },
    });
    return { userId };
  });
}

/** Accepting as someone who already has an account and is signed in with that e-mail. */
export async function acceptInvitationAsUser(input: { token: string; userId: string; email: string; now: Date }): Promise<void> {
  await db().transaction(async (trx) => {
    const inv = await findLiveInvitation(trx, input.token, input.now);
    if (!inv) throw badRequest("This invitation has expired or was already used. Ask for a new one.", { token: "expired or used" });
    if (normaliseEmail(inv.email) !== normaliseEmail(input.email)) {
      throw new HttpError(403, "forbidden", `This invitation is for ${inv.email}. Sign in with that account.`);
    }
    await trx("memberships").insert({ organisation_id: inv.organisation_id, user_id: input.userId, role: inv.role }).onConflict(["organisation_id", "user_id"]).ignore();
    await trx("invitations").where({ id: inv.id }).update({ accepted_at: input.now });
    await trx("users").where({ id: input.userId }).update({ last_org_id: inv.organisation_id });
    await writeAudit(trx, { organisationId: inv.organisation_id, actorUserId: input.userId, action: "member.joined", entity: "membership", entityId: input.userId, details: { role: inv.role } });
  });
}

async function lockOwners(trx: Knex, organisationId: number): Promise<string[]> {
  const rows = await trx("memberships").where({ organisation_id: organisationId, role: "owner" }).forUpdate().select("user_id");
  return rows.map((r) => r.user_id);
}

export async function changeRole(input: { organisationId: number; actorUserId: string; userId: string; role: Role }): Promise<void> {
  await db().transaction(async (trx) => {
    const owners = await lockOwners(trx, input.organisationId);
    const member = await trx("memberships").where({ organisation_id: input.organisationId, user_id: input.userId }).forUpdate().first();
    if (!member) throw notFound("That person is not a member of this organisation.");
    if (member.role === input.role) return;
    if (member.role === "owner" && owners.length <= 1) {
      throw conflict("An organisation needs at least one owner: make someone else owner first.", { role: "last owner" });
    }
    await trx("memberships").where({ id: member.id }).update({ role: input.role, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId: input.organisationId,
      actorUserId: input.actorUserId,
      action: "member.role_changed",
      entity: "membership",
      entityId: input.userId,
      details: { from: member.role, to: input.role },
    });
  });
}

export async function removeMember(input: { organisationId: number; actorUserId: string; userId: string }): Promise<void> {
  await db().transaction(async (trx) => {
    const owners = await lockOwners(trx, input.organisationId);
    const member = await trx("memberships").where({ organisation_id: input.organisationId, user_id: input.userId }).forUpdate().first();
    if (!member) throw notFound("That person is not a member of this organisation.");
    if (member.role === "owner" && owners.length <= 1) {
      throw conflict("The last owner cannot be removed: make someone else owner first.", { userId: "last owner" });
    }
    await trx("memberships").where({ id: member.id }).delete();
    await writeAudit(trx, {
      organisationId: input.organisationId,
      actorUserId: input.actorUserId,
      action: "member.removed",
      entity: "membership",
      entityId: input.userId,
      details: { role: member.role },
    });
  });
}

export async function revokeInvitation(input: { organisationId: number; actorUserId: string; invitationId: number; now: Date }): Promise<void> {
  await db().transaction(async (trx) => {
    const n = await trx("invitations")
      .where({ id: input.invitationId, organisation_id: input.organisationId })
      .whereNull("accepted_at")
      .whereNull("revoked_at")
      .update({ revoked_at: input.now });
    if (n !== 1) throw notFound("No pending invitation with that id.");
    await writeAudit(trx, { organisationId: input.organisationId, actorUserId: input.actorUserId, action: "invitation.revoked", entity: "invitation", entityId: input.invitationId });
  });
}

export async function listAudit(organisationId: number, limit = 50) {
  return db()("audit_log as a")
    .leftJoin("users as u", "u.id", "a.actor_user_id")
    .where("a.organisation_id", organisationId)
    .orderBy("a.id", "desc")
    .limit(limit)
    .select("a.id", "a.action", "a.entity", "a.entity_id", "a.details", "a.created_at", "u.name as actor_name");
}
