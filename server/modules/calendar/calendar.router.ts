import type { DataSource } from "typeorm";
import {
  calendarQuerySchema,
  calendarResponseSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { getCalendar } from "./calendar.service";

export function registerCalendarRoutes(api: ApiRoutes, ds: DataSource): void {
  api.add({
    method: "get",
    path: "/calendar",
    tag: "calendar",
    summary:
      "Entries and day marks for a date range: the workshop's live jobs (scope=workshop), one job (scope=job) or a trade's own visits (scope=me)",
    query: calendarQuerySchema,
    response: calendarResponseSchema,
    handler: async ({ actor, query }) => getCalendar(ds, actor, query),
  });
}
