import { hash, verify } from "@node-rs/argon2";

// Argon2id with m = 19456 KiB (19 MiB), t = 2, p = 1: one of the equal-strength settings the
// OWASP Password Storage Cheat Sheet recommends (section "Argon2id").
const ARGON2ID = { algorithm: 2, memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2ID);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false; // a malformed stored hash never signs anyone in
  }
}
