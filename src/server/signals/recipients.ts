import type { Knex } from "knex";
import { randomBytes } from "node:crypto";
import type { Role } from "../../lib/permissions.ts";

export type Topic = "drift" | "due" | "jobs";
export type Mode = "immediate" | "digest" | "off";

/** Signal kinds by mail topic: crew chiefs follow readings, managers follow the calendar. */
export function topicOfKind(kind: string): Topic {
  return kind === "due-soon" || kind === "overdue" ? "due" : "drift";
}

/**
 * What each role gets when the person has not chosen: crew chiefs drift, managers due dates,
 * mechanics their jobs, owners a daily digest of both (in a small shop the owner is often the
 * only one who would hear of it).
 */
export const DEFAULT_MODES: Record<Role, Record<Topic, Mode>> = {
  owner: { drift: "digest", due: "digest", jobs: "off" },
  manager: { drift: "off", due: "immediate", jobs: "off" },
  crew_chief: { drift: "immediate", due: "off", jobs: "off" },
  mechanic: { drift: "off", due: "off", jobs: "immediate" },
  viewer: { drift: "off", due: "off", jobs: "off" },
};

export interface Recipient {
  userId: string;
  email: string;
  name: string;
  role: Role;
  modes: Record<Topic, Mode>;
}

export async function loadRecipients(k: Knex, organisationId: number): Promise<Recipient[]> {
  const members = await k("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.organisation_id", organisationId)
    .select("u.id", "u.email", "u.name", "m.role");
  const prefs = await k("notification_preferences").where({ organisation_id: organisationId }).select("user_id", "topic", "mode");
  return members.map((m) => {
    const modes = { ...DEFAULT_MODES[m.role as Role] };
    for (const p of prefs) if (p.user_id === m.id) modes[p.topic as Topic] = p.mode as Mode;
    return { userId: m.id, email: m.email, name: m.name, role: m.role as Role, modes };
  });
}

/** The person's unsubscribe token for this organisation, created on first use. */
export async function mailToken(k: Knex, userId: string, organisationId: number): Promise<string> {
  const existing = await k("mail_tokens").where({ user_id: userId, organisation_id: organisationId }).first("token");
  if (existing) return existing.token;
  const token = randomBytes(24).toString("base64url");
  await k("mail_tokens").insert({ token, user_id: userId, organisation_id: organisationId }).onConflict(["user_id", "organisation_id"]).ignore();
  const row = await k("mail_tokens").where({ user_id: userId, organisation_id: organisationId }).first("token");
  return row.token;
}

export async function setPreference(k: Knex, userId: string, organisationId: number, topic: Topic, mode: Mode): Promise<void> {
  await k("notification_preferences")
    .insert({ user_id: userId, organisation_id: organisationId, topic, mode })
    .onConflict(["user_id", "organisation_id", "topic"])
    .merge({ mode, updated_at: k.fn.now() });
}
