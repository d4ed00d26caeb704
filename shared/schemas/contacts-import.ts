import { z } from "zod";
import { tradeKindSchema } from "./common";
import { customerResponseSchema } from "./customers";
import { tradeResponseSchema } from "./trades";

// Trades and customers brought in from a phone's contacts (vCard) or a spreadsheet (CSV), issue 14.
// The server reads the file into a preview (nothing saved); a second request saves the rows the
// person chose, checked again with the same schema the add form uses.

/** The most of a file's text one import reads (about 2,000 contacts); more is refused with 413. */
export const IMPORT_MAX_BYTES = 512 * 1024;
/** The most rows one import saves. */
export const IMPORT_MAX_ROWS = 2000;

/** A contacts file as text: the browser reads it and sends it in a JSON body. */
export const importFileBodySchema = z.object({
  fileName: z.string().trim().min(1, "Choose a file").max(255),
  text: z.string(),
});
export type ImportFileBody = z.input<typeof importFileBodySchema>;

/** Another trade or customer a row looks like: one already kept, or an earlier row of the file. */
export const importDuplicateSchema = z.object({
  existing: z.boolean(),
  /** The kept record's name, or "row 3". */
  name: z.string(),
  by: z.array(z.enum(["e-mail", "phone"])),
  /** "Same phone as Hartley Plastering (already one of your trades)". */
  message: z.string(),
});
export type ImportDuplicate = z.infer<typeof importDuplicateSchema>;

const previewRowBase = {
  /** Row number as the person counts them: a CSV's data rows from 1, or the card's place in the file. */
  row: z.number().int().positive(),
  email: z.string(),
  phone: z.string(),
  duplicate: importDuplicateSchema.nullable(),
  /** Why the row cannot be saved as it is ("Row 4: no e-mail address"); empty when it can. */
  problems: z.array(z.string()),
};

export const tradeImportPreviewSchema = z.object({
  format: z.enum(["vcard", "csv"]),
  rows: z.array(
    z.object({
      ...previewRowBase,
      businessName: z.string(),
      contactName: z.string(),
      /** Sitecue's guess from the card's categories, title or note, or the sheet's Trade column. */
      suggestedKind: tradeKindSchema.nullable(),
      /** The words the guess came from, shown beside the choice. */
      kindHint: z.string(),
    }),
  ),
});
export type TradeImportPreview = z.infer<typeof tradeImportPreviewSchema>;

export const customerImportPreviewSchema = z.object({
  format: z.enum(["vcard", "csv"]),
  rows: z.array(z.object({ ...previewRowBase, name: z.string() })),
});
export type CustomerImportPreview = z.infer<typeof customerImportPreviewSchema>;

// The rows sent back are loose strings at this boundary: each is checked in the service with
// tradeBodySchema / customerBodySchema, so a refusal names the row ("Row 4: no e-mail address").
const loose = z.string().max(500).default("");
const confirmRowBase = {
  row: z.number().int().positive(),
  email: loose,
  phone: loose,
  /** Save it even though it looks like a duplicate (the person ticked it in). */
  addDuplicate: z.boolean().default(false),
};

export const tradeImportConfirmSchema = z.object({
  rows: z
    .array(
      z.object({
        ...confirmRowBase,
        businessName: loose,
        contactName: loose,
        kind: z.string().max(40).nullable().default(null),
      }),
    )
    .min(1, "Choose at least one row to add")
    .max(IMPORT_MAX_ROWS),
});
export type TradeImportConfirm = z.input<typeof tradeImportConfirmSchema>;

export const customerImportConfirmSchema = z.object({
  rows: z
    .array(z.object({ ...confirmRowBase, name: loose }))
    .min(1, "Choose at least one row to add")
    .max(IMPORT_MAX_ROWS),
});
export type CustomerImportConfirm = z.input<typeof customerImportConfirmSchema>;

const skippedSchema = z.array(
  z.object({ row: z.number(), reason: z.string() }),
);

export const tradeImportResultSchema = z.object({
  added: z.array(tradeResponseSchema),
  /** Duplicates left out because they were not ticked in. */
  skipped: skippedSchema,
});
export type TradeImportResult = z.infer<typeof tradeImportResultSchema>;

export const customerImportResultSchema = z.object({
  added: z.array(customerResponseSchema),
  skipped: skippedSchema,
});
export type CustomerImportResult = z.infer<typeof customerImportResultSchema>;
