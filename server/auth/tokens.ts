import { createHash, randomBytes } from "node:crypto";

/** A new single-use token for a mailed link: 32 random bytes, base64url; only its SHA-256 is stored. */
export function createToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export const INVITATION_LIFETIME_MS = 72 * 3600_000;
export const RESET_LIFETIME_MS = 3600_000;
