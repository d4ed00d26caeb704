import { z } from "zod";
import type { DataSource } from "typeorm";
import { idSchema, outboxRetryResponseSchema } from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { retryMail } from "./outbox.service";

export function registerOutboxRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "post",
    path: "/workshops/:workshopId/outbox/:messageId/retry",
    tag: "outbox",
    summary:
      "Send a failed e-mail again: back in the queue with its attempts reset and the same Message-ID",
    params: z.object({ workshopId: idSchema, messageId: idSchema }),
    response: outboxRetryResponseSchema,
    handler: async ({ actor, params }) =>
      retryMail(ds, actor, params.workshopId, params.messageId),
  });
}
