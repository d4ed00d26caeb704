import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  idSchema,
  starterBodySchema,
  starterResponseSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import {
  listStarters,
  replaceStarter,
  deleteStarter,
} from "./starters.service";

const workshop = z.object({ workshopId: idSchema });

export function registerStarterRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "get",
    path: "/workshops/:workshopId/starters",
    tag: "programme",
    summary: "The workshop's starting programmes",
    params: workshop,
    response: z.object({ starters: z.array(starterResponseSchema) }),
    handler: async ({ actor, params }) => ({
      starters: await listStarters(ds, actor, params.workshopId),
    }),
  });
  api.add({
    method: "put",
    path: "/workshops/:workshopId/starters/:starterId",
    tag: "programme",
    summary: "Edit a starting programme",
    params: workshop.extend({ starterId: idSchema }),
    body: starterBodySchema,
    response: starterResponseSchema,
    handler: async ({ actor, params, body }) =>
      replaceStarter(ds, actor, params.workshopId, params.starterId, body),
  });
  api.add({
    method: "delete",
    path: "/workshops/:workshopId/starters/:starterId",
    tag: "programme",
    summary: "Delete a starting programme (owner)",
    params: workshop.extend({ starterId: idSchema }),
    status: 204,
    handler: async ({ actor, params }) =>
      deleteStarter(ds, actor, params.workshopId, params.starterId),
  });
}
