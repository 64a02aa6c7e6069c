import type { Knex } from "knex";

export interface LeaseResult {
  held: boolean;
  holder: string;
  expiresAt: Date;
}

/**
 * Takes or renews the lease `name` for `holder` until now + ttl. Returns held=false when another
 * holder's lease has not expired. Two processes racing for a new row: the primary key lets one in.
 */
export async function acquireLease(k: Knex, name: string, holder: string, ttlMs: number, now: Date): Promise<LeaseResult> {
  const expiresAt = new Date(now.getTime() + ttlMs);
  try {
    return await k.transaction(async (trx) => {
      const row = await trx("job_leases").where({ name }).forUpdate().first();
      if (!row) {
        await trx("job_leases").insert({ name, holder, expires_at: expiresAt, acquired_at: now, renewed_at: now });
        return { held: true, holder, expiresAt };
      }
      const current = new Date(row.expires_at);
      if (row.holder === holder || current <= now) {
        await trx("job_leases")
          .where({ name })
          .update({
            holder,
            expires_at: expiresAt,
            renewed_at: now,
            ...(row.holder === holder ? {} : { acquired_at: now }),
          });
        return { held: true, holder, expiresAt };
      }
      return { held: false, holder: row.holder, expiresAt: current };
    });
  } catch (err) {
    if ((err as { code?: string }).code === "ER_DUP_ENTRY") {
      const row = await k("job_leases").where({ name }).first();
      return { held: false, holder: row?.holder ?? "unknown", expiresAt: new Date(row?.expires_at ?? now) };
    }
    throw err;
  }
}

export async function releaseLease(k: Knex, name: string, holder: string): Promise<void> {
  await k("job_leases").where({ name, holder }).delete();
}
