import { createHash } from "node:crypto";
import type { Request, Response } from "express";
import type { DataSource } from "typeorm";
import {
  daysOffBodySchema,
  daysOffResponseSchema,
  feedCreatedResponseSchema,
  feedStatusResponseSchema,
  feedTokenParamsSchema,
} from "../../../shared/schemas";
import { notFound } from "../../http/errors";
import type { ApiRoutes } from "../../http/routes";
import { loadSessionUser } from "../users/users.service";
import { feedContent } from "./feed-content";
import {
  createFeed,
  feedForToken,
  feedStatus,
  getDaysOff,
  revokeFeed,
  setDaysOff,
} from "./feeds.service";

export interface FeedDeps {
  ds: DataSource;
  appUrl: string;
  replyDomain: string;
}

/**
 * RFC 9110 §13.1.2 and §13.1.3: If-None-Match wins over If-Modified-Since; HTTP dates have whole
 * seconds, so Last-Modified is compared at that precision.
 */
function notModified(req: Request, etag: string, lastModified: Date): boolean {
  const inm = req.get("if-none-match");
  if (inm !== undefined)
    return inm
      .split(",")
      .map((t) => t.trim().replace(/^W\//, ""))
      .some((t) => t === "*" || t === etag);
  const ims = req.get("if-modified-since");
  if (!ims) return false;
  const since = Date.parse(ims);
  return (
    !Number.isNaN(since) &&
    Math.floor(lastModified.getTime() / 1000) * 1000 <= since
  );
}

function sendCalendar(
  req: Request,
  res: Response,
  body: string,
  lastModified: Date,
): void {
  const etag = `"${createHash("sha256").update(body).digest("base64url")}"`;
  res.setHeader("ETag", etag);
  res.setHeader("Last-Modified", lastModified.toUTCString());
  // A secret URL: never kept by shared caches; apps may reuse it for five minutes.
  res.setHeader("Cache-Control", "private, max-age=300");
  if (notModified(req, etag, lastModified)) {
    res.status(304).end();
    return;
  }
  res.setHeader("Content-Type", "text/calendar; charset=utf-8");
  res.status(200).send(body);
}

export function registerFeedRoutes(api: ApiRoutes, deps: FeedDeps): void {
  const { ds } = deps;
  const tag = "feeds";
  api.add({
    method: "get",
    path: "/me/feed",
    tag,
    summary: "Whether I have a calendar feed URL (it is shown only when made)",
    response: feedStatusResponseSchema,
    handler: async ({ actor }) => feedStatus(ds, actor),
  });
  api.add({
    method: "post",
    path: "/me/feed",
    tag,
    summary: "Make (or remake, revoking the old one) my calendar feed URL",
    status: 201,
    response: feedCreatedResponseSchema,
    handler: async ({ actor }) => createFeed(ds, deps.appUrl, actor),
  });
  api.add({
    method: "delete",
    path: "/me/feed",
    tag,
    summary: "Revoke my calendar feed URL",
    status: 204,
    handler: async ({ actor }) => {
      await revokeFeed(ds, actor);
    },
  });
  api.add({
    method: "get",
    path: "/feeds/:token",
    tag,
    summary:
      "A calendar subscription feed (text/calendar, PUBLISH): whoever holds the secret URL",
    params: feedTokenParamsSchema,
    handler: async ({ req, res, params }) => {
      const feed = await feedForToken(ds, params.token);
      const owner = feed && (await loadSessionUser(ds.manager, feed.userId));
      if (!feed || !owner) throw notFound("That calendar feed");
      const content = await feedContent(
        ds.manager,
        deps,
        owner.actor,
        owner.user.name,
        feed.createdAt,
      );
      sendCalendar(req, res, content.body, content.lastModified);
    },
  });
  api.add({
    method: "get",
    path: "/me/days-off",
    tag,
    summary: "My days off (a trade's, the same for every workshop)",
    response: daysOffResponseSchema,
    handler: async ({ actor }) => getDaysOff(ds, actor),
  });
  api.add({
    method: "put",
    path: "/me/days-off",
    tag,
    summary: "Set my days off once, for every workshop I work for (trades)",
    body: daysOffBodySchema,
    response: daysOffResponseSchema,
    handler: async ({ actor, body }) => setDaysOff(ds, actor, body.daysOff),
  });
}
