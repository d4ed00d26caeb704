import { z } from "zod";
import type { DataSource } from "typeorm";
import { attentionResponseSchema, idSchema } from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { attentionFor } from "./attention.service";

export function registerAttentionRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "get",
    path: "/workshops/:workshopId/attention",
    tag: "attention",
    summary:
      "What needs the workshop now across its open jobs (bookings to answer or chase, declines, clashes, unbooked work, handovers at risk, unread messages), most urgent first",
    params: z.object({ workshopId: idSchema }),
    response: attentionResponseSchema,
    handler: async ({ actor, params }) =>
      attentionFor(ds, actor, params.workshopId),
  });
}
