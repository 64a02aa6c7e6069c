import knexFactory, { type Knex } from "knex";
import { afterAll } from "vitest";
import config from "../../knexfile.ts";

/** Direct database access for tests that check rows (the server under test uses its own pool). */
let k: Knex | null = null;
export function testDb(): Knex {
  if (!k) {
    k = knexFactory({ ...config, pool: { min: 0, max: 4 } });
    afterAll(async () => {
      await k?.destroy();
      k = null;
    });
  }
  return k;
}

export async function clearSignInAttempts(): Promise<void> {
  await testDb()("sign_in_attempts").delete();
}
