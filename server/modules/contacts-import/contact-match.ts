import type { ImportDuplicate, TradeKind } from "../../../shared/schemas";

/**
 * A phone number reduced to the digits that are dialled in the UK, so "+44 7700 900123",
 * "0044 7700 900123" and "07700 900123" are one number (ITU-T E.164: +44 replaces the trunk 0).
 * Numbers of other countries keep their + and country code.
 */
export function normalisePhone(phone: string): string {
  const trimmed = phone.trim();
  let digits = trimmed.replace(/\D/g, "");
  if (trimmed.startsWith("+")) digits = `+${digits}`;
  else if (digits.startsWith("00")) digits = `+${digits.slice(2)}`;
  // "+44 (0)7700…" writes the trunk 0 in brackets; it is not dialled after +44.
  if (digits.startsWith("+440")) digits = `+44${digits.slice(4)}`;
  if (digits.startsWith("+44")) return `0${digits.slice(3)}`;
  return digits;
}

/** An e-mail address compared as Sitecue stores it (lower case, trimmed). */
export const normaliseEmail = (email: string) => email.trim().toLowerCase();

// Words trades and phones use for each kind; the first that matches wins.
const KIND_WORDS: [TradeKind, RegExp][] = [
  ["plasterer", /plaster|skim|render|dry ?lin|coving/i],
  ["decorator", /decorat|paint|wallpaper|paper ?hang/i],
  ["electrician", /electric|spark|wiring|\bniceic\b/i],
  ["plumber", /plumb|heating|boiler|gas safe/i],
  ["flooring", /floor|carpet|laminate|vinyl|parquet/i],
  ["other", /^other( trade)?$|^trade$/i],
];

/** Sitecue's guess at a trade's kind from the words on its card or row, with the words it read. */
export function suggestKind(hints: string[]): {
  kind: TradeKind | null;
  hint: string;
} {
  for (const h of hints)
    for (const [kind, words] of KIND_WORDS)
      if (words.test(h)) return { kind, hint: h.slice(0, 80) };
  return { kind: null, hint: hints[0]?.slice(0, 80) ?? "" };
}

/** The e-mail addresses and phones already seen (kept records, earlier rows), to flag duplicates. */
export class DuplicateFinder {
  private byEmail = new Map<string, { name: string; existing: boolean }>();
  private byPhone = new Map<string, { name: string; existing: boolean }>();

  constructor(private readonly recordWords: string) {}

  /** Remembers a kept record or a row, so later rows with its e-mail or phone are flagged. */
  add(
    who: { name: string; existing: boolean },
    email: string,
    phone: string | null,
  ) {
    const e = normaliseEmail(email);
    if (e && !this.byEmail.has(e)) this.byEmail.set(e, who);
    const p = phone ? normalisePhone(phone) : "";
    if (p.replace("+", "").length >= 6 && !this.byPhone.has(p))
      this.byPhone.set(p, who);
  }

  /** The record or earlier row this one has the same e-mail or phone as, or null. */
  find(email: string, phone: string): ImportDuplicate | null {
    const e = this.byEmail.get(normaliseEmail(email));
    const p = phone.trim()
      ? this.byPhone.get(normalisePhone(phone))
      : undefined;
    const who = e ?? p;
    if (!who) return null;
    const by: ImportDuplicate["by"] = [];
    if (e === who) by.push("e-mail");
    if (p === who) by.push("phone");
    const same = by.length === 2 ? "e-mail and phone" : by[0];
    return {
      existing: who.existing,
      name: who.name,
      by,
      message: who.existing
        ? `Same ${same} as ${who.name} (already one of your ${this.recordWords})`
        : `Same ${same} as ${who.name} of this file`,
    };
  }
}
