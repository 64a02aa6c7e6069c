import { hash, verify } from "@node-rs/argon2";

// Algorithm.Argon2id of @node-rs/argon2 (an ambient const enum, so written as its value).
const ARGON2ID = 2;

/**
 * argon2id with the OWASP Password Storage Cheat Sheet's first option: 19 MiB memory,
 * two iterations, one lane.
 */
export const ARGON2_OPTIONS = {
  algorithm: ARGON2ID,
  memoryCost: 19456,
  timeCost: 2,
  parallelism: 1,
  outputLen: 32,
} as const;

export const PASSWORD_MIN_LENGTH = 10;

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  if (!passwordHash) return false;
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

// Verifying against a real hash when the account does not exist keeps the response time the same.
let decoy: Promise<string> | null = null;
export async function verifyDecoy(password: string): Promise<void> {
  decoy ??= hash("ringland-decoy-password", ARGON2_OPTIONS);
  await verify(await decoy, password).catch(() => false);
}
