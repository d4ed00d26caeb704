import { hash, verify } from "@node-rs/argon2";
import { dictionary } from "@zxcvbn-ts/language-common";
import { HttpError } from "../../http/errors";

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

// zxcvbn-ts's list of the ~49,000 passwords seen most often in breach corpuses, lower case.
// Imported here only (server side), so the browser never downloads it.
const breached: ReadonlySet<string> = new Set(
  dictionary["passwords-common"].map((p) => p.toLowerCase()),
);

/** The words a person reads when a new password is refused (one place, used by every route). */
export const passwordRefusals = {
  breached:
    "That password is on a list of passwords used in breaches — choose another",
  context:
    "Don't use your e-mail address or the workshop's name as your password — choose another",
} as const;

/**
 * Why a new password may not be used, or null when it may. The length rule is the shared
 * `passwordSchema`'s; this adds what NIST SP 800-63B §5.1.1.2 asks a verifier to compare a new
 * password against: passwords from breach corpuses and context-specific words (here the e-mail
 * address, its local part and the workshop's name), compared without case. No composition rules.
 * OWASP ASVS v4.0.3 2.1.7 (checked against breached passwords), 2.1.9 (no composition rules).
 */
export function checkNewPassword(
  password: string,
  context: { email: string; workshopNames?: readonly string[] },
): string | null {
  const p = password.trim().toLowerCase();
  if (breached.has(p)) return passwordRefusals.breached;
  const email = context.email.toLowerCase();
  const words = [email, email.split("@")[0]!, ...(context.workshopNames ?? [])]
    .map((w) => w.trim().toLowerCase())
    .filter((w) => w.length > 0);
  if (words.includes(p)) return passwordRefusals.context;
  return null;
}

/** Throws the API's 400 (naming the password field) when `checkNewPassword` refuses it. */
export function refuseWeakPassword(
  password: string,
  context: { email: string; workshopNames?: readonly string[] },
): void {
  const reason = checkNewPassword(password, context);
  if (reason)
    throw new HttpError(400, "validation", "Some fields need attention.", {
      password: [reason],
    });
}
