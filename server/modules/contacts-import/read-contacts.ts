import ICAL from "ical.js";
import Papa from "papaparse";
import { HttpError } from "../../http/errors";

/** One contact as read from a file, before any of Sitecue's rules are applied. */
export interface RawContact {
  /** The person's count: a CSV's data rows from 1 (the header is not counted), or the card's place. */
  row: number;
  businessName: string;
  contactName: string;
  email: string;
  phone: string;
  /** Words that may say the trade: vCard CATEGORIES, TITLE and NOTE; a sheet's Trade/Kind column. */
  hints: string[];
}

export interface ReadContacts {
  format: "vcard" | "csv";
  contacts: RawContact[];
}

const first = (v: unknown): string =>
  Array.isArray(v) ? first(v[0]) : typeof v === "string" ? v.trim() : "";

const typesOf = (p: ICAL.Property): string[] => {
  const t = p.getParameter("type");
  return (Array.isArray(t) ? t : t ? [t] : [])
    .flatMap((x) => String(x).split(","))
    .map((x) => x.trim().toLowerCase());
};

/** RFC 6350 §5.3 PREF (1 is most preferred) or vCard 3.0's TYPE=pref (RFC 2426 §3.3.1). */
const prefOf = (p: ICAL.Property): number => {
  const pref = Number(p.getParameter("pref"));
  if (Number.isFinite(pref) && pref > 0) return pref;
  return typesOf(p).includes("pref") ? 1 : 100;
};

/** The value to keep among several: the preferred one, then one of the liked types, then the first. */
function pick(props: ICAL.Property[], liked: string[]): ICAL.Property | null {
  if (!props.length) return null;
  const score = (p: ICAL.Property) => {
    const types = typesOf(p);
    const i = liked.findIndex((l) => types.includes(l));
    // A fax or pager number is no use for booking a trade.
    const unusable =
      types.includes("fax") || types.includes("pager") ? 1000 : 0;
    return unusable + prefOf(p) * 10 + (i === -1 ? liked.length : i);
  };
  return [...props].sort((a, b) => score(a) - score(b))[0];
}

/** A TEL value as dialled: vCard 4.0 gives a `tel:` URI (RFC 3966), maybe with `;ext=`. */
function telText(p: ICAL.Property): string {
  const v = first(p.getFirstValue());
  return v.replace(/^tel:/i, "").replace(/;.*$/, "").trim();
}

// vCard 2.1 (still exported by some phones) writes quoted-printable values with soft line breaks
// ("=" at a line's end, RFC 2045 §6.7) that are not RFC 6350 §3.2 folding; join them before parsing.
// vCard 2.1 also writes bare parameters ("TEL;CELL:", "NOTE;QUOTED-PRINTABLE:"), which 3.0 and
// 4.0 spell TYPE=CELL and ENCODING=QUOTED-PRINTABLE; they are rewritten so ical.js reads them.
function from21(text: string): string {
  let joined = text;
  // Soft breaks first, repeated: one value may be broken over several lines.
  for (let i = 0; i < 200; i++) {
    const next = joined.replace(
      /^([^:\r\n]*QUOTED-PRINTABLE[^:\r\n]*:.*?)=\r?\n/gim,
      (_m, start: string) => start,
    );
    if (next === joined) break;
    joined = next;
  }
  return joined.replace(
    /^([A-Za-z0-9.-]+)((?:;[^:;\r\n]*)+):/gm,
    (_m, name: string, params: string) =>
      `${name}${params
        .split(";")
        .slice(1)
        .map((p) =>
          p.includes("=")
            ? `;${p}`
            : /^(quoted-printable|base64|8bit|7bit)$/i.test(p)
              ? `;ENCODING=${p}`
              : `;TYPE=${p}`,
        )
        .join("")}:`,
  );
}

function decodeQuotedPrintable(value: string, charset: string): string {
  const bytes: number[] = [];
  for (let i = 0; i < value.length; i++) {
    const hex = value.slice(i + 1, i + 3);
    if (value[i] === "=" && /^[0-9A-F]{2}$/i.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else bytes.push(value.charCodeAt(i) & 0xff);
  }
  try {
    return new TextDecoder(charset || "utf-8").decode(new Uint8Array(bytes));
  } catch {
    return new TextDecoder("utf-8").decode(new Uint8Array(bytes));
  }
}

function text(p: ICAL.Property | null): string {
  if (!p) return "";
  const raw = p.getValues().map(first).filter(Boolean).join(", ");
  const enc = String(p.getParameter("encoding") ?? "").toLowerCase();
  if (enc === "quoted-printable")
    return decodeQuotedPrintable(raw, String(p.getParameter("charset") ?? ""));
  return raw;
}

/**
 * Reads every card of a vCard file: RFC 6350 (4.0) and RFC 2426 (3.0, what most phones export),
 * through ical.js, which unfolds lines and reads both versions' parameters.
 */
export function readVCards(source: string): RawContact[] {
  let parsed: unknown;
  try {
    parsed = ICAL.parse(from21(source));
  } catch (e) {
    throw new HttpError(
      422,
      "unprocessable",
      `This vCard file could not be read: ${(e as Error).message}. Export the contacts again and retry.`,
    );
  }
  // One card parses to one component, several to a list of them.
  const list = (
    Array.isArray(parsed) && typeof parsed[0] === "string" ? [parsed] : parsed
  ) as unknown[];
  return list
    .map((jcal) => new ICAL.Component(jcal as never))
    .filter((c) => c.name === "vcard")
    .map((card, i) => {
      const org = card.getFirstProperty("org");
      const n = card.getFirstProperty("n");
      // N is family; given; additional; prefixes; suffixes (RFC 6350 §6.2.2).
      const nParts = (n?.getFirstValue() ?? []) as unknown;
      const fromN = Array.isArray(nParts)
        ? [first(nParts[1]), first(nParts[0])].filter(Boolean).join(" ")
        : first(nParts);
      const contactName = text(card.getFirstProperty("fn")) || fromN;
      // ORG's first component is the organisation's name; the rest are units.
      const business = org ? first(org.getFirstValue()) : "";
      const tel = pick(card.getAllProperties("tel"), ["work", "cell", "voice"]);
      const email = pick(card.getAllProperties("email"), ["work", "internet"]);
      return {
        row: i + 1,
        businessName: business || contactName,
        contactName,
        email: email ? text(email) : "",
        phone: tel ? telText(tel) : "",
        hints: [
          ...card.getAllProperties("categories").map(text),
          text(card.getFirstProperty("title")),
          text(card.getFirstProperty("role")),
          text(card.getFirstProperty("note")),
        ].filter(Boolean),
      };
    });
}

// Header names people's spreadsheets use for each field, compared without case, spaces or
// punctuation ("E-mail address" == "email address").
const HEADERS: Record<Exclude<keyof RawContact, "row">, string[]> = {
  businessName: [
    "business",
    "businessname",
    "company",
    "companyname",
    "organisation",
    "organization",
    "org",
    "firm",
    "firma",
  ],
  contactName: [
    "name",
    "contact",
    "contactname",
    "fullname",
    "person",
    "customer",
    "customername",
  ],
  email: ["email", "emailaddress", "mail", "emailaddress1"],
  phone: [
    "phone",
    "mobile",
    "phonenumber",
    "mobilenumber",
    "telephone",
    "tel",
    "cell",
    "mobilephone",
    "workphone",
    "telefon",
    "handy",
  ],
  hints: [
    "trade",
    "kind",
    "type",
    "category",
    "categories",
    "jobtitle",
    "title",
    "notes",
    "note",
  ],
};
const squash = (h: string) => h.toLowerCase().replace(/[^a-z0-9]/g, "");

/**
 * Reads a CSV with a header row (RFC 4180) through papaparse: a byte-order mark is dropped, and
 * the separator is found from the data, so `;`-separated sheets from European spreadsheets read too.
 */
export function readCsv(source: string): RawContact[] {
  const result = Papa.parse<string[]>(source.replace(/^\uFEFF/, ""), {
    skipEmptyLines: "greedy",
    delimitersToGuess: [",", ";", "\t", "|"],
  });
  const [header, ...data] = result.data;
  if (!header)
    throw new HttpError(422, "unprocessable", "This file has no rows.");
  const columns = header.map((h) => {
    const key = squash(h);
    return (Object.keys(HEADERS) as (keyof typeof HEADERS)[]).find((f) =>
      HEADERS[f].includes(key),
    );
  });
  if (!columns.some((c) => c === "email" || c === "phone"))
    throw new HttpError(
      422,
      "unprocessable",
      `The first row should name the columns (for example Business, Name, Email, Phone, Trade); this one reads "${header.join(", ").slice(0, 120)}".`,
    );
  return data.map((cells, i) => {
    const c: RawContact = {
      row: i + 1,
      businessName: "",
      contactName: "",
      email: "",
      phone: "",
      hints: [],
    };
    cells.forEach((cell, j) => {
      const f = columns[j];
      // A cell Sitecue's own export guarded against formulas (import-rows.ts) reads back as typed.
      const v = (cell ?? "").trim().replace(/^'(?=[=+\-@])/, "");
      if (!f || !v) return;
      if (f === "hints") c.hints.push(v);
      else if (!c[f]) c[f] = v;
    });
    if (!c.businessName) c.businessName = c.contactName;
    return c;
  });
}

/** Reads a contacts file: vCard when it holds a card (whatever its name), CSV otherwise. */
export function readContacts(fileName: string, source: string): ReadContacts {
  const isVCard =
    /^\s*(\uFEFF)?BEGIN:VCARD/i.test(source) ||
    /\.(vcf|vcard)$/i.test(fileName);
  return isVCard
    ? { format: "vcard", contacts: readVCards(source.replace(/^\uFEFF/, "")) }
    : { format: "csv", contacts: readCsv(source) };
}
