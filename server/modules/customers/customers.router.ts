import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  customerBodySchema,
  customerImportConfirmSchema,
  customerImportPreviewSchema,
  customerImportResultSchema,
  importFileBodySchema,
  customerResponseSchema,
  idSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { createCustomer, listCustomers } from "./customers.service";
import { sendCsv } from "../contacts-import/import-rows";
import {
  confirmCustomerImport,
  exportCustomersCsv,
  previewCustomerImport,
} from "./customers-import";

const params = z.object({ workshopId: idSchema });

export function registerCustomerRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "get",
    path: "/workshops/:workshopId/customers",
    tag: "customers",
    summary: "The workshop's customers",
    params,
    response: z.object({ customers: z.array(customerResponseSchema) }),
    handler: async ({ actor, params }) => ({
      customers: await listCustomers(ds, actor, params.workshopId),
    }),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/customers",
    tag: "customers",
    summary: "Add a customer",
    params,
    body: customerBodySchema,
    status: 201,
    response: customerResponseSchema,
    handler: async ({ actor, params, body }) =>
      createCustomer(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/customers/import/preview",
    tag: "customers",
    summary:
      "Read a CSV file into customer rows to choose from (nothing is saved)",
    params,
    body: importFileBodySchema,
    response: customerImportPreviewSchema,
    handler: async ({ actor, params, body }) =>
      previewCustomerImport(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/customers/import",
    tag: "customers",
    summary:
      "Add the chosen rows of an import, all or nothing (duplicates only when ticked in)",
    params,
    body: customerImportConfirmSchema,
    status: 201,
    response: customerImportResultSchema,
    handler: async ({ actor, params, body }) =>
      confirmCustomerImport(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/customers.csv",
    tag: "customers",
    summary: "The workshop's customers as a CSV download",
    params,
    handler: async ({ actor, params, res }) =>
      sendCsv(
        res,
        "customers.csv",
        await exportCustomersCsv(ds, actor, params.workshopId),
      ),
  });
}
