import { createHash, randomBytes } from "node:crypto";
import { In, IsNull, type DataSource, type EntityManager } from "typeorm";
import type {
  DaysOffResponse,
  FeedCreatedResponse,
  FeedStatusResponse,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { authorize, type Actor } from "../../policies";
import { audit } from "../audit/audit.service";
import { TradeMember, Trade } from "../trades/trades.entity";
import { CalendarFeed } from "./feeds.entity";

/** SHA-256 (hex) of a feed token: what the database keeps instead of the token. */
export function hashFeedToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** A token as it appears in a URL: 32 random bytes, base64url (43 characters). */
const tokenPattern = /^[A-Za-z0-9_-]{43}$/;

/** The feed a token in a URL opens, or null (unknown, revoked or malformed). ".ics" is optional. */
export async function feedForToken(
  ds: DataSource,
  raw: string,
): Promise<CalendarFeed | null> {
  const token = raw.endsWith(".ics") ? raw.slice(0, -4) : raw;
  if (!tokenPattern.test(token)) return null;
  return ds.getRepository(CalendarFeed).findOneBy({
    tokenHash: hashFeedToken(token),
    revokedAt: IsNull(),
  });
}

const activeFeed = (m: EntityManager, userId: string) =>
  m.findOne(CalendarFeed, {
    where: { userId, revokedAt: IsNull() },
    order: { createdAt: "DESC" },
  });

/** Whether the signed-in person has a feed URL (the URL itself cannot be shown again). */
export async function feedStatus(
  ds: DataSource,
  actor: Actor | null,
): Promise<FeedStatusResponse> {
  authorize(actor, "feed.manage", {
    kind: "person",
    userId: actor?.userId ?? "",
  });
  const feed = await activeFeed(ds.manager, actor.userId);
  return {
    exists: feed !== null,
    createdAt: feed ? feed.createdAt.toISOString() : null,
  };
}

/** Makes a new feed URL for a person, revoking any earlier one; the token is returned once. */
export async function issueFeed(
  ds: DataSource,
  appUrl: string,
  userId: string,
): Promise<FeedCreatedResponse> {
  const token = randomBytes(32).toString("base64url");
  await ds.transaction(async (m) => {
    await m.update(
      CalendarFeed,
      { userId, revokedAt: IsNull() },
      { revokedAt: new Date() },
    );
    await m.insert(CalendarFeed, {
      id: newId(),
      userId,
      tokenHash: hashFeedToken(token),
      revokedAt: null,
    });
    await audit(m, {
      workshopId: null,
      actorUserId: userId,
      action: "feed.issued",
      entityType: "calendar-feed",
      entityId: null,
    });
  });
  return { url: `${appUrl.replace(/\/$/, "")}/api/feeds/${token}.ics` };
}

/** POST /api/me/feed: create or regenerate the signed-in person's feed URL. */
export async function createFeed(
  ds: DataSource,
  appUrl: string,
  actor: Actor | null,
): Promise<FeedCreatedResponse> {
  authorize(actor, "feed.manage", {
    kind: "person",
    userId: actor?.userId ?? "",
  });
  return issueFeed(ds, appUrl, actor.userId);
}

/** DELETE /api/me/feed: the old URL stops working at once. */
export async function revokeFeed(
  ds: DataSource,
  actor: Actor | null,
): Promise<void> {
  authorize(actor, "feed.manage", {
    kind: "person",
    userId: actor?.userId ?? "",
  });
  await ds.transaction(async (m) => {
    const res = await m.update(
      CalendarFeed,
      { userId: actor.userId, revokedAt: IsNull() },
      { revokedAt: new Date() },
    );
    if (res.affected)
      await audit(m, {
        workshopId: null,
        actorUserId: actor.userId,
        action: "feed.revoked",
        entityType: "calendar-feed",
        entityId: null,
      });
  });
}

const linkedTrades = async (m: EntityManager, userId: string) => {
  const links = await m.findBy(TradeMember, { userId });
  return links.length
    ? m.findBy(Trade, { id: In(links.map((l) => l.tradeId)) })
    : [];
};

/** The trade's days off: the union over their trade records (they match once entered here). */
export async function getDaysOff(
  ds: DataSource,
  actor: Actor | null,
): Promise<DaysOffResponse> {
  authorize(actor, "daysOff.read", {
    kind: "person",
    userId: actor?.userId ?? "",
  });
  const trades = await linkedTrades(ds.manager, actor.userId);
  return { daysOff: [...new Set(trades.flatMap((t) => t.daysOff))].sort() };
}

/** Writes one list of days off to every trade record the person speaks for, in every workshop. */
export async function setDaysOff(
  ds: DataSource,
  actor: Actor | null,
  daysOff: string[],
): Promise<DaysOffResponse> {
  authorize(actor, "daysOff.update", {
    kind: "person",
    userId: actor?.userId ?? "",
  });
  const list = [...new Set(daysOff)].sort();
  await ds.transaction(async (m) => {
    await writeDaysOff(
      m,
      actor.userId,
      await linkedTrades(m, actor.userId),
      list,
    );
  });
  return { daysOff: list };
}

/**
 * Makes a person's days off one set again after a new trade record is linked to them (issue 14):
 * the union of every linked record's days off (those they entered here, and any the new
 * workshop had noted) goes to all of them. Inside the linking transaction.
 */
export async function shareDaysOff(
  m: EntityManager,
  userId: string,
): Promise<string[]> {
  const trades = await linkedTrades(m, userId);
  const list = [...new Set(trades.flatMap((t) => t.daysOff))].sort();
  const differing = trades.filter(
    (t) => [...t.daysOff].sort().join() !== list.join(),
  );
  await writeDaysOff(m, userId, differing, list);
  return list;
}

async function writeDaysOff(
  m: EntityManager,
  actorUserId: string,
  trades: Trade[],
  list: string[],
): Promise<void> {
  for (const t of trades) {
    await m.update(Trade, { id: t.id }, { daysOff: list });
    await audit(m, {
      workshopId: t.workshopId,
      actorUserId,
      action: "trade.daysOff.updated",
      entityType: "trade",
      entityId: t.id,
      detail: { before: t.daysOff, after: list },
    });
  }
}
