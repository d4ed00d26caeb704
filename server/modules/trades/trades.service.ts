import { In, IsNull, Not, type DataSource } from "typeorm";
import type { z } from "zod";
import type { Actor } from "../../policies";
import { authorize, requireActor } from "../../policies";
import { newId } from "../../db/columns";
import { HttpError, notFound } from "../../http/errors";
import { audit } from "../audit/audit.service";
import { Booking } from "../bookings/bookings.entity";
import { User } from "../users/users.entity";
import { Trade, TradeMember } from "./trades.entity";
import type {
  TradeBusyResponse,
  TradeResponse,
  tradeBodySchema,
  updateTradeBodySchema,
} from "../../../shared/schemas";

export function presentTrade(
  t: Trade,
  hasAccount: boolean,
  emailHasAccount = false,
): TradeResponse {
  return {
    id: t.id,
    workshopId: t.workshopId,
    businessName: t.businessName,
    kind: t.kind,
    contactName: t.contactName,
    email: t.email,
    phone: t.phone,
    workingWeekdays: t.workingWeekdays,
    dayStart: t.dayStart,
    dayEnd: t.dayEnd,
    daysOff: [...t.daysOff].sort(),
    hasAccount,
    emailHasAccount: !hasAccount && emailHasAccount,
  };
}

async function withAccounts(
  ds: DataSource,
  trades: Trade[],
): Promise<TradeResponse[]> {
  if (!trades.length) return [];
  const links = await ds.getRepository(TradeMember).find({
    where: { tradeId: In(trades.map((t) => t.id)) },
    select: { tradeId: true },
  });
  const linked = new Set(links.map((l) => l.tradeId));
  // Only whether an account exists (one with a password): never which workshops it works for
  // or what their records say (DEVELOPERS.md "One account for a trade across workshops").
  const accounts = await ds.getRepository(User).find({
    where: {
      email: In([...new Set(trades.map((t) => t.email.toLowerCase()))]),
      passwordHash: Not(IsNull()),
    },
    select: { email: true },
  });
  const withAccount = new Set(accounts.map((u) => u.email));
  return trades.map((t) =>
    presentTrade(t, linked.has(t.id), withAccount.has(t.email.toLowerCase())),
  );
}

/** The workshop's trades, by kind then name. */
export async function listTrades(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<TradeResponse[]> {
  authorize(actor, "trades.read", { kind: "workshop", workshopId });
  const trades = await ds.getRepository(Trade).find({
    where: { workshopId },
    order: { kind: "ASC", businessName: "ASC" },
  });
  return withAccounts(ds, trades);
}

export async function createTrade(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof tradeBodySchema>,
): Promise<TradeResponse> {
  authorize(actor, "trades.create", { kind: "workshop", workshopId });
  const trade = ds
    .getRepository(Trade)
    .create({ id: newId(), workshopId, ...body });
  await ds.transaction(async (m) => {
    await m.insert(Trade, trade);
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "trade.created",
      entityType: "trade",
      entityId: trade.id,
      detail: { businessName: body.businessName, kind: body.kind },
    });
  });
  const [created] = await withAccounts(ds, [
    await ds.getRepository(Trade).findOneByOrFail({ id: trade.id }),
  ]);
  return created;
}

async function load(ds: DataSource, actor: Actor | null, tradeId: string) {
  requireActor(actor);
  const trade = await ds.getRepository(Trade).findOneBy({ id: tradeId });
  if (!trade) throw notFound("That trade");
  return trade;
}

export async function updateTrade(
  ds: DataSource,
  actor: Actor | null,
  tradeId: string,
  body: z.output<typeof updateTradeBodySchema>,
): Promise<TradeResponse> {
  const trade = await load(ds, actor, tradeId);
  authorize(actor, "trades.update", {
    kind: "trade",
    workshopId: trade.workshopId,
    tradeId,
  });
  await ds.transaction(async (m) => {
    await m.update(Trade, { id: tradeId }, body);
    await audit(m, {
      workshopId: trade.workshopId,
      actorUserId: actor!.userId,
      action: "trade.updated",
      entityType: "trade",
      entityId: tradeId,
      detail: body,
    });
  });
  const [updated] = await withAccounts(ds, [
    await ds.getRepository(Trade).findOneByOrFail({ id: tradeId }),
  ]);
  return updated;
}

/** Deletes a trade with no bookings (owner). */
export async function deleteTrade(
  ds: DataSource,
  actor: Actor | null,
  tradeId: string,
): Promise<void> {
  const trade = await load(ds, actor, tradeId);
  authorize(actor, "trades.delete", {
    kind: "trade",
    workshopId: trade.workshopId,
    tradeId,
  });
  const bookings = await ds.getRepository(Booking).countBy({ tradeId });
  if (bookings > 0) {
    throw new HttpError(
      409,
      "conflict",
      `${trade.businessName} has ${bookings} booking${bookings === 1 ? "" : "s"}; cancel or move them before removing the trade.`,
    );
  }
  await ds.transaction(async (m) => {
    await m.delete(Trade, { id: tradeId });
    await audit(m, {
      workshopId: trade.workshopId,
      actorUserId: actor!.userId,
      action: "trade.deleted",
      entityType: "trade",
      entityId: tradeId,
      detail: { businessName: trade.businessName },
    });
  });
}

/**
 * A trade's bookings that hold their time (sent or later) overlapping a range: this workshop's
 * with the task and job named; those for other workshops the same person works for, only as
 * busy — another workshop's jobs, customers and addresses are not this workshop's to see.
 */
export async function tradeBusy(
  ds: DataSource,
  actor: Actor | null,
  tradeId: string,
  from: string,
  to: string,
): Promise<TradeBusyResponse["busy"]> {
  const trade = await load(ds, actor, tradeId);
  authorize(actor, "trades.read", {
    kind: "trade",
    workshopId: trade.workshopId,
    tradeId,
  });
  const holding = In([
    "sent",
    "confirmed",
    "date-proposed",
    "needs-reconfirming",
  ] as const);
  const inRange = (b: Booking) =>
    b.start.slice(0, 10) <= to && b.finish.slice(0, 10) >= from;
  const own = (
    await ds.getRepository(Booking).find({
      where: { tradeId, state: holding },
      relations: { job: true, task: true },
    })
  ).filter(inRange);
  const people = await ds
    .getRepository(TradeMember)
    .find({ where: { tradeId }, select: { userId: true } });
  const elsewhere = people.length
    ? (
        await ds.getRepository(TradeMember).find({
          where: {
            userId: In(people.map((p) => p.userId)),
            workshopId: Not(trade.workshopId),
          },
          select: { tradeId: true },
        })
      ).map((l) => l.tradeId)
    : [];
  const theirs = elsewhere.length
    ? (
        await ds
          .getRepository(Booking)
          .find({ where: { tradeId: In(elsewhere), state: holding } })
      ).filter(inRange)
    : [];
  return [
    ...own.map((b) => ({
      start: b.start,
      finish: b.finish,
      label: `${b.task?.name ?? "Booking"} — ${b.job?.title ?? "a job"}`,
      ownWorkshop: true,
    })),
    ...theirs.map((b) => ({
      start: b.start,
      finish: b.finish,
      label: "Busy (another workshop)",
      ownWorkshop: false,
    })),
  ].sort((a, b) => a.start.localeCompare(b.start));
}
