import type { Knex } from "knex";

export interface LeaseResult {
  held: boolean;
  holder: string;
  expiresAt: Date;
}

/**
 * Takes or renews the lease `name` for `holder` until now + ttl. Returns held=false when another
 * holder's lease has not expired. Two processes racing for a new row both find none, and both
 * insert: InnoDB lets one in and refuses the other, with a duplicate key or, as their gap locks
 * cross, a deadlock. The refused one simply asks again; the row is there then, and it waits for
 * the winner's commit and reads it.
 */
export async function acquireLease(k: Knex, name: string, holder: string, ttlMs: number, now: Date): Promise<LeaseResult> {
  for (let attempt = 1; ; attempt += 1) {
    try {
      return await tryLease(k, name, holder, ttlMs, now);
    } catch (err) {
      const code = (err as { code?: string }).code;
      if (attempt >= 3 || (code !== "ER_DUP_ENTRY" && code !== "ER_LOCK_DEADLOCK")) throw err;
    }
  }
}

async function tryLease(k: Knex, name: string, holder: string, ttlMs: number, now: Date): Promise<LeaseResult> {
  const expiresAt = new Date(now.getTime() + ttlMs);
  return k.transaction(async (trx) => {
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
}

export async function releaseLease(k: Knex, name: string, holder: string): Promise<void> {
  await k("job_leases").where({ name, holder }).delete();
}
