import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from "lucia";
import { db } from "../../db/client.ts";
import { useSecureCookies } from "../env.ts";

interface SessionRow {
  id: string;
  user_id: string;
  expires_at: Date;
}
interface UserRow {
  id: string;
  email: string;
  name: string;
  last_org_id: number | null;
  unit_system: "metric" | "imperial" | null;
}

function toSession(row: SessionRow): DatabaseSession {
  return { id: row.id, userId: row.user_id, expiresAt: new Date(row.expires_at), attributes: {} };
}

/** Lucia's storage, in our own `sessions` table through Knex. */
export const knexSessionAdapter: Adapter = {
  async getSessionAndUser(sessionId) {
    const row = await db()("sessions as s")
      .join("users as u", "u.id", "s.user_id")
      .where("s.id", sessionId)
      .first<(SessionRow & Omit<UserRow, "id">) | undefined>(
        "s.id",
        "s.user_id",
        "s.expires_at",
        "u.email",
        "u.name",
        "u.last_org_id",
        "u.unit_system",
      );
    if (!row) return [null, null];
    const user: DatabaseUser = {
      id: row.user_id,
      attributes: { email: row.email, name: row.name, lastOrgId: row.last_org_id, unitSystem: row.unit_system },
    };
    return [toSession(row), user];
  },
  async getUserSessions(userId) {
    const rows = await db()<SessionRow>("sessions").where("user_id", userId);
    return rows.map(toSession);
  },
  async setSession(session) {
    await db()("sessions").insert({ id: session.id, user_id: session.userId, expires_at: session.expiresAt });
  },
  async updateSessionExpiration(sessionId, expiresAt) {
    await db()("sessions").where("id", sessionId).update({ expires_at: expiresAt, updated_at: db().fn.now() });
  },
  async deleteSession(sessionId) {
    await db()("sessions").where("id", sessionId).delete();
  },
  async deleteUserSessions(userId) {
    await db()("sessions").where("user_id", userId).delete();
  },
  async deleteExpiredSessions() {
    await db()("sessions").where("expires_at", "<=", new Date()).delete();
  },
};

/** Sessions last 30 days and slide: lucia extends one that is used in its second half. */
export const SESSION_DAYS = 30;

export const lucia = new Lucia(knexSessionAdapter, {
  sessionExpiresIn: new TimeSpan(SESSION_DAYS, "d"),
  sessionCookie: {
    name: "ringland_session",
    attributes: { secure: useSecureCookies(), sameSite: "lax", path: "/" },
  },
  getUserAttributes: (a) => ({
    email: a.email,
    name: a.name,
    lastOrgId: a.lastOrgId,
    unitSystem: a.unitSystem,
  }),
});

declare module "lucia" {
  interface Register {
    Lucia: typeof lucia;
    DatabaseUserAttributes: {
      email: string;
      name: string;
      lastOrgId: number | null;
      unitSystem: "metric" | "imperial" | null;
    };
  }
}
