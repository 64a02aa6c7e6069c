import type { Knex } from "knex";

export interface AuditEntry {
  organisationId: number | null;
  actorUserId: string | null;
  action: string; // verb.noun, e.g. "member.role_changed"
  entity: string;
  entityId?: string | number | null;
  details?: Record<string, unknown>;
}

/** Every change a person makes is written here, inside the same transaction as the change. */
export async function writeAudit(trx: Knex, entry: AuditEntry): Promise<void> {
  await trx("audit_log").insert({
    organisation_id: entry.organisationId,
    actor_user_id: entry.actorUserId,
    action: entry.action,
    entity: entry.entity,
    entity_id: entry.entityId == null ? null : String(entry.entityId),
    details: entry.details ? JSON.stringify(entry.details) : null,
  });
}
