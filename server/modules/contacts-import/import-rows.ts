import type { Response } from "express";
import Papa from "papaparse";
import type { z } from "zod";
import {
  IMPORT_MAX_BYTES,
  IMPORT_MAX_ROWS,
  type ImportFileBody,
} from "../../../shared/schemas";
import { HttpError } from "../../http/errors";
import { contentDisposition } from "../files/files.service";
import { readContacts, type ReadContacts } from "./read-contacts";

/** Reads an uploaded contacts file within the import's limits (413 past them, with the numbers). */
export function readImportFile(body: ImportFileBody): ReadContacts {
  const bytes = Buffer.byteLength(body.text, "utf8");
  if (bytes > IMPORT_MAX_BYTES)
    throw new HttpError(
      413,
      "too-large",
      `${body.fileName} is ${Math.ceil(bytes / 1024)} KB; import at most ${IMPORT_MAX_BYTES / 1024} KB at a time. Split the file and import each part.`,
    );
  if (!body.text.trim())
    throw new HttpError(422, "unprocessable", `${body.fileName} is empty.`);
  const read = readContacts(body.fileName, body.text);
  if (read.contacts.length === 0)
    throw new HttpError(
      422,
      "unprocessable",
      `${body.fileName} holds no contacts.`,
    );
  if (read.contacts.length > IMPORT_MAX_ROWS)
    throw new HttpError(
      413,
      "too-large",
      `${body.fileName} holds ${read.contacts.length} contacts; import at most ${IMPORT_MAX_ROWS} at a time.`,
    );
  return read;
}

/**
 * Checks one row with the add form's own schema and says what is wrong in the person's words:
 * an empty field is "no e-mail address", anything else the schema's message ("Row 4: E-mail:
 * Enter a valid e-mail address").
 */
export function checkRow<S extends z.ZodType>(
  schema: S,
  input: Record<string, unknown>,
  row: number,
  words: Record<string, { none: string; label: string }>,
):
  | { ok: true; value: z.output<S>; problems: [] }
  | { ok: false; problems: string[]; fields: Record<string, string[]> } {
  const result = schema.safeParse(input);
  if (result.success) return { ok: true, value: result.data, problems: [] };
  const problems: string[] = [];
  const fields: Record<string, string[]> = {};
  for (const issue of result.error.issues) {
    const key = String(issue.path[0] ?? "");
    const w = words[key] ?? { none: `no ${key}`, label: key };
    const value = input[key];
    const empty = value === undefined || value === null || value === "";
    const text = empty ? w.none : `${w.label}: ${issue.message}`;
    if (problems.includes(`Row ${row}: ${text}`)) continue;
    problems.push(`Row ${row}: ${text}`);
    (fields[key] ??= []).push(text);
  }
  return { ok: false, problems, fields };
}

/** Refuses a confirm that has bad rows: 422, every bad row named, nothing saved. */
export function badRowsRefusal(
  bad: {
    index: number;
    problems: string[];
    fields: Record<string, string[]>;
  }[],
): HttpError {
  const fields: Record<string, string[]> = {};
  for (const b of bad)
    for (const [k, v] of Object.entries(b.fields))
      fields[`rows.${b.index}.${k}`] = v;
  const all = bad.flatMap((b) => b.problems);
  return new HttpError(
    422,
    "unprocessable",
    `Nothing was added. ${all.slice(0, 10).join(". ")}${all.length > 10 ? `, and ${all.length - 10} more` : ""}.`,
    fields,
  );
}

// OWASP "CSV Injection": a cell a spreadsheet would run as a formula (= + - @, or a tab or
// carriage return before one) is written with a leading apostrophe, so it shows as text.
const FORMULA_START = /^[=+\-@\t\r]/;

/** One cell, safe to open in a spreadsheet. */
export function safeCell(value: string): string {
  return FORMULA_START.test(value) ? `'${value}` : value;
}

/** A CSV document (RFC 4180: CRLF line ends, fields quoted where needed) with a header row. */
export function toCsv(header: string[], rows: string[][]): string {
  return Papa.unparse(
    { fields: header, data: rows.map((r) => r.map(safeCell)) },
    { newline: "\r\n", quotes: false },
  );
}

/** Sends a CSV as a download (RFC 4180 §3 media type, RFC 6266 attachment). */
export function sendCsv(res: Response, fileName: string, csv: string): void {
  res.setHeader("Content-Type", "text/csv; charset=utf-8; header=present");
  res.setHeader(
    "Content-Disposition",
    contentDisposition("attachment", fileName),
  );
  // A byte-order mark, so spreadsheet programs read the UTF-8 names right; the import drops it.
  res.status(200).send(`\uFEFF${csv}\r\n`);
}
