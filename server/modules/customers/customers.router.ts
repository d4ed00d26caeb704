import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  customerBodySchema,
  customerResponseSchema,
  idSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { createCustomer, listCustomers } from "./customers.service";

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
}
