import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  idSchema,
  importFileBodySchema,
  tradeBodySchema,
  tradeImportConfirmSchema,
  tradeImportPreviewSchema,
  tradeImportResultSchema,
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
import { sendCsv } from "../contacts-import/import-rows";
import {
  confirmTradeImport,
  exportTradesCsv,
  previewTradeImport,
} from "./trades-import";

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
  api.add({
    method: "post",
    path: "/workshops/:workshopId/trades/import/preview",
    tag: "trades",
    summary:
      "Read a vCard or CSV file into trade rows to choose from (nothing is saved)",
    params: workshopParams,
    body: importFileBodySchema,
    response: tradeImportPreviewSchema,
    handler: async ({ actor, params, body }) =>
      previewTradeImport(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/trades/import",
    tag: "trades",
    summary:
      "Add the chosen rows of an import, all or nothing (duplicates only when ticked in)",
    params: workshopParams,
    body: tradeImportConfirmSchema,
    status: 201,
    response: tradeImportResultSchema,
    handler: async ({ actor, params, body }) =>
      confirmTradeImport(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/trades.csv",
    tag: "trades",
    summary: "The workshop's trades as a CSV download",
    params: workshopParams,
    handler: async ({ actor, params, res }) =>
      sendCsv(
        res,
        "trades.csv",
        await exportTradesCsv(ds, actor, params.workshopId),
      ),
  });
}
