import { hash, verify } from "@node-rs/argon2";

// OWASP's argon2id baseline (19 MiB, 2 passes, 1 lane); @node-rs/argon2 uses argon2id by default.
const OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

// Verified against for unknown e-mail addresses so that a miss takes as long as a wrong password.
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword("spanwright-timing-equaliser");
  return dummyHash;
}
