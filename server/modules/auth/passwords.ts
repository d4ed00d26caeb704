import { hash, verify } from "@node-rs/argon2";

// argon2id (RFC 9106) with the library's defaults: memory 19 MiB, 2 passes — OWASP's minimum.
// Algorithm.Argon2id is 2; the const enum cannot be imported under isolatedModules.
const options = { algorithm: 2 as const };

/** Hashes a password with argon2id. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, options);
}

// A real hash of a random string: verifying against it when the e-mail is unknown keeps the
// time of a failed sign-in the same whether or not the account exists.
const dummyHash = hash(crypto.randomUUID(), options);

/** Checks a password against a stored hash (or a dummy one, in the same time, when there is none). */
export async function verifyPassword(
  stored: string | null,
  password: string,
): Promise<boolean> {
  if (!stored) {
    await verify(await dummyHash, password).catch(() => false);
    return false;
  }
  return verify(stored, password).catch(() => false);
}
