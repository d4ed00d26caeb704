// Reading contacts files (issue 14): vCard 4.0 (RFC 6350) and 3.0 (RFC 2426) through ical.js,
// CSV through papaparse. Pure functions, no database.
import { readFileSync } from "node:fs";
import path from "node:path";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { normalisePhone, suggestKind, DuplicateFinder } from "./contact-match";
import { safeCell, toCsv } from "./import-rows";
import { readContacts } from "./read-contacts";

const fixture = (name: string) =>
  readFileSync(
    path.join(import.meta.dirname, "../../../tests/fixtures/contacts", name),
    "utf8",
  );

describe("vCard", () => {
  it("reads the RFC 6350 §8 example card (vCard 4.0)", () => {
    // The card exactly as printed in RFC 6350 §8, with its folded ADR and KEY lines.
    const { format, contacts } = readContacts(
      "simon.vcf",
      fixture("rfc6350-section8.vcf"),
    );
    expect(format).toBe("vcard");
    expect(contacts).toEqual([
      {
        row: 1,
        businessName: "Viagenie",
        contactName: "Simon Perreault",
        email: "simon.perreault@viagenie.ca",
        // TEL is a tel: URI (RFC 3966) with ;ext=; PREF=1 (RFC 6350 §5.3) picks the first of two.
        phone: "+1-418-656-9254",
        hints: [],
      },
    ]);
  });

  it("reads both cards of the RFC 2426 §7 example (vCard 3.0, as phones export): EMAIL;TYPE=PREF, no fax", () => {
    const { contacts } = readContacts(
      "contacts.vcf",
      fixture("rfc2426-section7.vcf"),
    );
    expect(contacts).toEqual([
      {
        row: 1,
        businessName: "Lotus Development Corporation",
        contactName: "Frank Dawson",
        email: "Frank_Dawson@Lotus.com",
        phone: "+1-919-676-9515",
        hints: [],
      },
      {
        row: 2,
        businessName: "Netscape Communications Corp.",
        contactName: "Tim Howes",
        email: "howes@netscape.com",
        phone: "+1-415-937-3419",
        hints: [],
      },
    ]);
  });

  it("reads a phone's many-card export: N without FN, no ORG, CATEGORIES/TITLE/NOTE as hints, a folded NOTE, quoted-printable", () => {
    const file = [
      "BEGIN:VCARD",
      "VERSION:3.0",
      "N:Ashby;Dan;;;",
      "ORG:Ashby Plaster & Coving",
      "TEL;TYPE=CELL:+44 7700 900123",
      "TEL;TYPE=HOME:01632 960 001",
      "EMAIL;TYPE=INTERNET;TYPE=HOME:dan@home.example.test",
      "EMAIL;TYPE=INTERNET;TYPE=WORK:dan@ashby.example.test",
      "CATEGORIES:Trades,Plastering",
      "END:VCARD",
      "BEGIN:VCARD",
      "VERSION:3.0",
      "FN:Priya Sparks",
      "TITLE:Electrician",
      "NOTE:NICEIC registered\\, does first fix and sec",
      " ond fix",
      "TEL:07700 900456",
      "END:VCARD",
      "BEGIN:VCARD",
      "VERSION:2.1",
      "N;CHARSET=UTF-8;ENCODING=QUOTED-PRINTABLE:M=C3=BCller;J=C3=B6rg",
      "FN;CHARSET=UTF-8;ENCODING=QUOTED-PRINTABLE:J=C3=B6rg M=C3=BCller Fl=",
      "ooring",
      "TEL;CELL:07700900789",
      "END:VCARD",
      "",
    ].join("\r\n");
    const { contacts } = readContacts("export.vcf", file);
    expect(contacts.map((c) => c.row)).toEqual([1, 2, 3]);
    expect(contacts[0]).toMatchObject({
      businessName: "Ashby Plaster & Coving",
      contactName: "Dan Ashby",
      email: "dan@ashby.example.test",
      phone: "+44 7700 900123",
      hints: ["Trades, Plastering"],
    });
    // No ORG: a sole trader's business is their own name.
    expect(contacts[1]).toMatchObject({
      businessName: "Priya Sparks",
      contactName: "Priya Sparks",
      email: "",
      phone: "07700 900456",
      hints: [
        "Electrician",
        "NICEIC registered, does first fix and second fix",
      ],
    });
    expect(contacts[2]).toMatchObject({
      contactName: "Jörg Müller Flooring",
      phone: "07700900789",
    });
    expect(suggestKind(contacts[0].hints).kind).toBe("plasterer");
    expect(suggestKind(contacts[1].hints).kind).toBe("electrician");
  });

  it("refuses a file that is not a vCard with a reason", () => {
    expect(() =>
      readContacts("broken.vcf", "BEGIN:VCARD\r\nthis is not a card"),
    ).toThrow(/could not be read/);
  });
});

describe("CSV", () => {
  it("reads a semicolon-separated sheet with a byte-order mark and European headers", () => {
    const { format, contacts } = readContacts(
      "Kontakte.csv",
      '\uFEFFFirma;Name;E-Mail;Handy;Trade\r\n"Decor; Paint & Paper";Jo Bloggs;jo@example.test;+44 7700 900321;Decorator\r\n;Sam Only;sam@example.test;;\r\n',
    );
    expect(format).toBe("csv");
    expect(contacts).toEqual([
      {
        row: 1,
        businessName: "Decor; Paint & Paper",
        contactName: "Jo Bloggs",
        email: "jo@example.test",
        phone: "+44 7700 900321",
        hints: ["Decorator"],
      },
      {
        row: 2,
        businessName: "Sam Only",
        contactName: "Sam Only",
        email: "sam@example.test",
        phone: "",
        hints: [],
      },
    ]);
  });

  it("maps the common header names", () => {
    const { contacts } = readContacts(
      "x.csv",
      "Company,Contact,Email address,Mobile,Kind\nTarn Floors,Ola Tarn,ola@example.test,07700 900654,Flooring\n",
    );
    expect(contacts[0]).toMatchObject({
      businessName: "Tarn Floors",
      contactName: "Ola Tarn",
      email: "ola@example.test",
      phone: "07700 900654",
      hints: ["Flooring"],
    });
  });

  it("refuses a sheet without a header row naming an e-mail or phone column", () => {
    expect(() => readContacts("x.csv", "Ashby,Dan,dan@example.test\n")).toThrow(
      /first row should name the columns/,
    );
  });
});

describe("phones and duplicates", () => {
  it("treats +44, 0044 and 0 forms of a UK number as one (E.164)", () => {
    const n = normalisePhone("07700 900123");
    expect(normalisePhone("+44 7700 900123")).toBe(n);
    expect(normalisePhone("+44 (0)7700 900123")).toBe(n);
    expect(normalisePhone("0044 7700-900-123")).toBe(n);
    expect(normalisePhone("+1-418-656-9254")).toBe("+14186569254");
    expect(normalisePhone("07700 900124")).not.toBe(n);
  });

  it("flags a row with a kept record's e-mail (any case) or phone, and a later row of the file", () => {
    const f = new DuplicateFinder("trades");
    f.add(
      { name: "Ashby", existing: true },
      "dan@ashby.example.test",
      "07700 900123",
    );
    expect(f.find("DAN@ashby.example.test", "")?.message).toBe(
      "Same e-mail as Ashby (already one of your trades)",
    );
    expect(f.find("x@example.test", "+44 7700 900123")?.by).toEqual(["phone"]);
    expect(f.find("x@example.test", "07700 900999")).toBeNull();
    f.add({ name: "row 2", existing: false }, "x@example.test", "");
    expect(f.find("x@example.test", "")?.message).toBe(
      "Same e-mail as row 2 of this file",
    );
  });
});

describe("CSV export", () => {
  it("prefixes cells a spreadsheet would run as formulas with ' (OWASP CSV Injection)", () => {
    for (const bad of ['=HYPERLINK("http://x")', "+441", "-2+3", "@SUM(A1)"])
      expect(safeCell(bad)).toBe(`'${bad}`);
    expect(safeCell("Ashby Plaster")).toBe("Ashby Plaster");
  });

  it("writes RFC 4180 CSV (CRLF, quotes where needed) that reads back as written", () => {
    const csv = toCsv(
      ["Business", "Email"],
      [
        ['Smith, "Sons" & Co', "a@example.test"],
        ["=1+1", "b@example.test"],
      ],
    );
    expect(csv).toBe(
      'Business,Email\r\n"Smith, ""Sons"" & Co",a@example.test\r\n\'=1+1,b@example.test',
    );
    expect(Papa.parse(csv).data).toEqual([
      ["Business", "Email"],
      ['Smith, "Sons" & Co', "a@example.test"],
      ["'=1+1", "b@example.test"],
    ]);
    // The import reads the guarded cell back as typed.
    expect(readContacts("t.csv", csv).contacts[1].businessName).toBe("=1+1");
  });
});
