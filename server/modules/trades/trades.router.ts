import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  idSchema,
  tradeBodySchema,
  tradeBusyQuerySchema,
  tradeBusyResponseSchema,
  tradeResponseSchema,
  updateTradeBodySchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import {
  createTrade,
  deleteTrade,
  listTrades,
  tradeBusy,
  updateTrade,
} from "./trades.service";

const workshopParams = z.object({ workshopId: idSchema });
const tradeParams = z.object({ tradeId: idSchema });

export function registerTradeRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "get",
    path: "/trades/:tradeId/busy",
    tag: "trades",
    summary:
      "A trade's commitments in a date range: this workshop's by name, other workshops' only as busy",
    params: tradeParams,
    query: tradeBusyQuerySchema,
    response: tradeBusyResponseSchema,
    handler: async ({ actor, params, query }) => ({
      busy: await tradeBusy(ds, actor, params.tradeId, query.from, query.to),
    }),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/trades",
    tag: "trades",
    summary: "The workshop's trades",
    params: workshopParams,
    response: z.object({ trades: z.array(tradeResponseSchema) }),
    handler: async ({ actor, params }) => ({
      trades: await listTrades(ds, actor, params.workshopId),
    }),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/trades",
    tag: "trades",
    summary: "Add a trade",
    params: workshopParams,
    body: tradeBodySchema,
    status: 201,
    response: tradeResponseSchema,
    handler: async ({ actor, params, body }) =>
      createTrade(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "patch",
    path: "/trades/:tradeId",
    tag: "trades",
    summary: "Edit a trade",
    params: tradeParams,
    body: updateTradeBodySchema,
    response: tradeResponseSchema,
    handler: async ({ actor, params, body }) =>
      updateTrade(ds, actor, params.tradeId, body),
  });
  api.add({
    method: "delete",
    path: "/trades/:tradeId",
    tag: "trades",
    summary: "Remove a trade with no bookings (owner)",
    params: tradeParams,
    status: 204,
    handler: async ({ actor, params }) =>
      deleteTrade(ds, actor, params.tradeId),
  });
}
