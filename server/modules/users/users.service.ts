import type { EntityManager } from "typeorm";
import type { Actor } from "../../policies";
import type { SessionUser } from "../../../shared/schemas";
import { User } from "./users.entity";
import { Workshop, WorkshopMember } from "../workshops/workshops.entity";
import { Trade, TradeMember } from "../trades/trades.entity";
import { Customer } from "../customers/customers.entity";

/**
 * Everything a signed-in person is: their memberships, the trades they speak for, their customer
 * records. Read through the caller's EntityManager (inside a transaction, its own connection).
 */
export async function loadSessionUser(
  m: EntityManager,
  userId: string,
): Promise<{ user: SessionUser; actor: Actor; generation: number } | null> {
  const user = await m.getRepository(User).findOneBy({ id: userId });
  if (!user) return null;
  const [members, tradeLinks, customers] = await Promise.all([
    m
      .getRepository(WorkshopMember)
      .find({ where: { userId }, relations: { workshop: true } }),
    m
      .getRepository(TradeMember)
      .find({ where: { userId }, relations: { trade: true, workshop: true } }),
    m
      .getRepository(Customer)
      .find({ where: { userId }, relations: { workshop: true } }),
  ]);
  const name = (w: Workshop | undefined) => w?.name ?? "";
  const sessionUser: SessionUser = {
    id: user.id,
    email: user.email,
    name: user.name,
    emailVerified: user.emailVerifiedAt !== null,
    memberships: members.map((m) => ({
      workshopId: m.workshopId,
      workshopName: name(m.workshop),
      role: m.role,
    })),
    trades: tradeLinks.map((t) => ({
      tradeId: t.tradeId,
      workshopId: t.workshopId,
      workshopName: name(t.workshop),
      businessName: (t.trade as Trade).businessName,
      kind: (t.trade as Trade).kind,
    })),
    customers: customers.map((c) => ({
      customerId: c.id,
      workshopId: c.workshopId,
      workshopName: name(c.workshop),
    })),
  };
  const actor: Actor = {
    userId,
    memberships: new Map(members.map((m) => [m.workshopId, m.role])),
    trades: new Map(tradeLinks.map((t) => [t.tradeId, t.workshopId])),
    customers: new Map(customers.map((c) => [c.id, c.workshopId])),
  };
  return { user: sessionUser, actor, generation: user.sessionGeneration };
}
