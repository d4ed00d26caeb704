import type { DataSource } from "typeorm";
import type { z } from "zod";
import {
  tradeBodySchema,
  type ImportFileBody,
  type TradeImportPreview,
  type TradeImportResult,
  type tradeImportConfirmSchema,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { authorize, type Actor } from "../../policies";
import { audit } from "../audit/audit.service";
import { DuplicateFinder, suggestKind } from "../contacts-import/contact-match";
import {
  badRowsRefusal,
  checkRow,
  readImportFile,
  toCsv,
} from "../contacts-import/import-rows";
import { Trade } from "./trades.entity";
import { presentTrade } from "./trades.service";

const WORDS = {
  businessName: { none: "no business name", label: "Business name" },
  contactName: { none: "no contact name", label: "Contact name" },
  email: { none: "no e-mail address", label: "E-mail" },
  phone: { none: "no phone number", label: "Phone" },
  kind: { none: "no trade chosen", label: "Trade" },
};

async function keptTrades(ds: DataSource, workshopId: string) {
  const finder = new DuplicateFinder("trades");
  for (const t of await ds.getRepository(Trade).find({
    where: { workshopId },
    select: { businessName: true, email: true, phone: true },
  }))
    finder.add({ name: t.businessName, existing: true }, t.email, t.phone);
  return finder;
}

/** Reads a vCard or CSV file into trade rows to choose from; saves nothing. */
export async function previewTradeImport(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: ImportFileBody,
): Promise<TradeImportPreview> {
  authorize(actor, "trades.create", { kind: "workshop", workshopId });
  const read = readImportFile(body);
  const finder = await keptTrades(ds, workshopId);
  const rows = read.contacts.map((c) => {
    const guess = suggestKind(c.hints);
    // The kind is the person's choice per row, so its absence is not a problem of the file's.
    const check = checkRow(
      tradeBodySchema,
      { ...c, kind: guess.kind ?? "other" },
      c.row,
      WORDS,
    );
    const duplicate = finder.find(c.email, c.phone);
    finder.add({ name: `row ${c.row}`, existing: false }, c.email, c.phone);
    return {
      row: c.row,
      businessName: c.businessName,
      contactName: c.contactName,
      email: c.email,
      phone: c.phone,
      suggestedKind: guess.kind,
      kindHint: guess.hint,
      duplicate,
      problems: check.problems,
    };
  });
  return { format: read.format, rows };
}

/**
 * Saves the chosen rows with their chosen kinds, all or nothing: each is checked again with the
 * add form's schema (any bad row refuses the lot, 422), and one that duplicates a kept trade or an
 * earlier chosen row is left out unless ticked in (`addDuplicate`). One audit entry.
 */
export async function confirmTradeImport(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof tradeImportConfirmSchema>,
): Promise<TradeImportResult> {
  authorize(actor, "trades.create", { kind: "workshop", workshopId });
  const checked = body.rows.map((r, index) => ({
    index,
    r,
    check: checkRow(
      tradeBodySchema,
      {
        businessName: r.businessName,
        contactName: r.contactName,
        email: r.email,
        phone: r.phone,
        kind: r.kind ?? undefined,
      },
      r.row,
      WORDS,
    ),
  }));
  const bad = checked.flatMap((c) =>
    c.check.ok ? [] : [{ index: c.index, ...c.check }],
  );
  if (bad.length) throw badRowsRefusal(bad);
  const finder = await keptTrades(ds, workshopId);
  const skipped: TradeImportResult["skipped"] = [];
  const trades: Trade[] = [];
  for (const { r, check } of checked) {
    if (!check.ok) continue;
    const v = check.value;
    const dup = finder.find(v.email, v.phone);
    if (dup && !r.addDuplicate) {
      skipped.push({ row: r.row, reason: dup.message });
      continue;
    }
    finder.add({ name: `row ${r.row}`, existing: false }, v.email, v.phone);
    trades.push(
      ds.getRepository(Trade).create({ id: newId(), workshopId, ...v }),
    );
  }
  await ds.transaction(async (m) => {
    if (trades.length) await m.insert(Trade, trades);
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "trades.imported",
      entityType: "workshop",
      entityId: workshopId,
      detail: {
        added: trades.length,
        skipped: skipped.length,
        tradeIds: trades.map((t) => t.id),
      },
    });
  });
  const saved = trades.length
    ? await ds.getRepository(Trade).findBy(trades.map((t) => ({ id: t.id })))
    : [];
  const byId = new Map(saved.map((t) => [t.id, t]));
  return {
    added: trades.map((t) => presentTrade(byId.get(t.id) ?? t, false)),
    skipped,
  };
}

/** The workshop's trades as CSV (RFC 4180), with the columns the import reads back. */
export async function exportTradesCsv(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<string> {
  authorize(actor, "trades.read", { kind: "workshop", workshopId });
  const trades = await ds.getRepository(Trade).find({
    where: { workshopId },
    order: { kind: "ASC", businessName: "ASC" },
  });
  return toCsv(
    [
      "Business",
      "Contact",
      "Trade",
      "Email",
      "Phone",
      "Working days",
      "Day starts",
      "Day ends",
    ],
    trades.map((t) => [
      t.businessName,
      t.contactName,
      t.kind,
      t.email,
      t.phone,
      // ISO 8601 weekday numbers, Monday = 1.
      t.workingWeekdays.join(" "),
      t.dayStart,
      t.dayEnd,
    ]),
  );
}
