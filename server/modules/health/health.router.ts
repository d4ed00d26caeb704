import type { DataSource } from "typeorm";
import { healthResponseSchema } from "../../../shared/schemas";
import type { DatabaseWatch } from "../../db/database-watch";
import type { ApiRoutes } from "../../http/routes";

export function registerHealthRoutes(
  api: ApiRoutes,
  ds: DataSource,
  watch: DatabaseWatch,
  version: string,
): void {
  // Checks that arrive while one is in flight share its answer: a monitor or load balancer polling
  // hard gets one database round trip at a time, each answer no older than that trip (issue 15).
  let inFlight: Promise<boolean> | null = null;
  const check = () =>
    (inFlight ??= ds
      .query("SELECT 1")
      .then(() => true)
      .catch((err: unknown) => {
        watch.markDown(err);
        return false;
      })
      .finally(() => {
        inFlight = null;
      }));
  api.add({
    method: "get",
    path: "/health",
    tag: "health",
    summary:
      "Whether the app and its database answer (503 while the database is down)",
    response: healthResponseSchema,
    handler: async ({ res }) => {
      const up = await check();
      if (up) {
        watch.markUp();
        return { status: "ok", database: "up", version };
      }
      // 503, so load balancers and monitors take this process out of service (RFC 9110 §15.6.4);
      // sent here because ApiRoutes would answer a returned body with the route's 200.
      res.status(503).json({ status: "degraded", database: "down", version });
    },
  });
}
