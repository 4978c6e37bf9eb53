import { createHash, randomBytes } from "node:crypto";

// 256 random bits per token (OWASP ASVS 5.0 V7.2.3 asks at least 128); only the SHA-256 is stored,
// so a copy of the database cannot be replayed as links.
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export const INVITATION_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000;
export const RESET_LIFETIME_MS = 60 * 60 * 1000;
