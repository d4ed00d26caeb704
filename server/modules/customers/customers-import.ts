import type { DataSource } from "typeorm";
import type { z } from "zod";
import {
  customerBodySchema,
  type CustomerImportPreview,
  type CustomerImportResult,
  type ImportFileBody,
  type customerImportConfirmSchema,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { authorize, type Actor } from "../../policies";
import { audit } from "../audit/audit.service";
import { DuplicateFinder } from "../contacts-import/contact-match";
import {
  badRowsRefusal,
  checkRow,
  readImportFile,
  toCsv,
} from "../contacts-import/import-rows";
import { Customer } from "./customers.entity";
import { presentCustomer } from "./customers.service";

const WORDS = {
  name: { none: "no name", label: "Name" },
  email: { none: "no e-mail address", label: "E-mail" },
  phone: { none: "no phone number", label: "Phone" },
};

// A customer's phone is optional (customerBodySchema): an empty cell is no phone, not a bad one.
const fields = (r: { name: string; email: string; phone: string }) => ({
  name: r.name,
  email: r.email,
  ...(r.phone.trim() ? { phone: r.phone } : {}),
});

async function keptCustomers(ds: DataSource, workshopId: string) {
  const finder = new DuplicateFinder("customers");
  for (const c of await ds.getRepository(Customer).find({
    where: { workshopId },
    select: { name: true, email: true, phone: true },
  }))
    finder.add({ name: c.name, existing: true }, c.email, c.phone);
  return finder;
}

/** Reads a CSV (or vCard) file into customer rows to choose from; saves nothing. */
export async function previewCustomerImport(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: ImportFileBody,
): Promise<CustomerImportPreview> {
  authorize(actor, "customers.create", { kind: "workshop", workshopId });
  const read = readImportFile(body);
  const finder = await keptCustomers(ds, workshopId);
  return {
    format: read.format,
    rows: read.contacts.map((c) => {
      // A householder has a name, not a business: the Name column, or the only name given.
      const name = c.contactName || c.businessName;
      const check = checkRow(
        customerBodySchema,
        fields({ name, email: c.email, phone: c.phone }),
        c.row,
        WORDS,
      );
      const duplicate = finder.find(c.email, c.phone);
      finder.add({ name: `row ${c.row}`, existing: false }, c.email, c.phone);
      return {
        row: c.row,
        name,
        email: c.email,
        phone: c.phone,
        duplicate,
        problems: check.problems,
      };
    }),
  };
}

/** Saves the chosen customer rows, all or nothing, duplicates left out unless ticked in; one audit entry. */
export async function confirmCustomerImport(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof customerImportConfirmSchema>,
): Promise<CustomerImportResult> {
  authorize(actor, "customers.create", { kind: "workshop", workshopId });
  const checked = body.rows.map((r, index) => ({
    index,
    r,
    check: checkRow(customerBodySchema, fields(r), r.row, WORDS),
  }));
  const bad = checked.flatMap((c) =>
    c.check.ok ? [] : [{ index: c.index, ...c.check }],
  );
  if (bad.length) throw badRowsRefusal(bad);
  const finder = await keptCustomers(ds, workshopId);
  const skipped: CustomerImportResult["skipped"] = [];
  const customers: Customer[] = [];
  for (const { r, check } of checked) {
    if (!check.ok) continue;
    const v = check.value;
    const dup = finder.find(v.email, v.phone ?? "");
    if (dup && !r.addDuplicate) {
      skipped.push({ row: r.row, reason: dup.message });
      continue;
    }
    finder.add(
      { name: `row ${r.row}`, existing: false },
      v.email,
      v.phone ?? null,
    );
    customers.push(
      ds.getRepository(Customer).create({
        id: newId(),
        workshopId,
        name: v.name,
        email: v.email,
        phone: v.phone ?? null,
        userId: null,
      }),
    );
  }
  await ds.transaction(async (m) => {
    if (customers.length) await m.insert(Customer, customers);
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "customers.imported",
      entityType: "workshop",
      entityId: workshopId,
      detail: {
        added: customers.length,
        skipped: skipped.length,
        customerIds: customers.map((c) => c.id),
      },
    });
  });
  return { added: customers.map(presentCustomer), skipped };
}

/** The workshop's customers as CSV (RFC 4180), with the columns the import reads back. */
export async function exportCustomersCsv(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<string> {
  authorize(actor, "customers.read", { kind: "workshop", workshopId });
  const customers = await ds
    .getRepository(Customer)
    .find({ where: { workshopId }, order: { name: "ASC" } });
  return toCsv(
    ["Name", "Email", "Phone"],
    customers.map((c) => [c.name, c.email, c.phone ?? ""]),
  );
}
