import { createHash, randomBytes } from "node:crypto";

/** A random link token (256 bits); only its SHA-256 is stored, so a database leak reveals no live link. */
export function newToken(): { raw: string; hash: string } {
  const raw = randomBytes(32).toString("base64url");
  return { raw, hash: hashToken(raw) };
}

export function hashToken(raw: string): string {
  return createHash("sha256").update(raw).digest("hex");
}
