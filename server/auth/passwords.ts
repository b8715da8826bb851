import { hash, verify } from "@node-rs/argon2";

// argon2id with OWASP's minimum recommended cost (m = 19 MiB, t = 2, p = 1); about 60 ms to hash on our 2-core machines.
const ARGON2ID = 2;
const OPTIONS = { algorithm: ARGON2ID, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

/** Hashes a password with argon2id; the result carries its own salt and parameters. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

/** Verifies a password against a stored argon2id hash; false on any malformed hash. */
export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
  try {
    return await verify(storedHash, password);
  } catch {
    return false;
  }
}

// Verified against when no account matches, so a wrong e-mail costs as long as a wrong password.
let decoyHash: Promise<string> | undefined;
export function decoyPasswordHash(): Promise<string> {
  decoyHash ??= hashPassword("lotwise-decoy-password-never-valid");
  return decoyHash;
}
