import type { DataSource } from "typeorm";
import type { z } from "zod";
import type { Actor } from "../../policies";
import { authorize } from "../../policies";
import { newId } from "../../db/columns";
import { audit } from "../audit/audit.service";
import { Customer } from "./customers.entity";
import type {
  CustomerResponse,
  customerBodySchema,
} from "../../../shared/schemas";

/** A customer as the workshop sees them. */
export const presentCustomer = (c: Customer): CustomerResponse => ({
  id: c.id,
  name: c.name,
  email: c.email,
  phone: c.phone,
  hasAccount: c.userId !== null,
});

/** The workshop's customers by name. */
export async function listCustomers(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<CustomerResponse[]> {
  authorize(actor, "customers.read", { kind: "workshop", workshopId });
  return (
    await ds
      .getRepository(Customer)
      .find({ where: { workshopId }, order: { name: "ASC" } })
  ).map(presentCustomer);
}

export async function createCustomer(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof customerBodySchema>,
): Promise<CustomerResponse> {
  authorize(actor, "customers.create", { kind: "workshop", workshopId });
  const customer = ds.getRepository(Customer).create({
    id: newId(),
    workshopId,
    name: body.name,
    email: body.email,
    phone: body.phone ?? null,
    userId: null,
  });
  await ds.transaction(async (m) => {
    await m.insert(Customer, customer);
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "customer.created",
      entityType: "customer",
      entityId: customer.id,
      detail: { name: body.name },
    });
  });
  return presentCustomer(customer);
}
