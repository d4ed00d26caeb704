import type { DataSource } from "typeorm";
import { Workshop } from "../modules/workshops/workshops.entity";
import { loadDemoScenario } from "../../tests/factories/demo-scenario";
import { localToday } from "../modules/jobs/jobs.presenter";
import type { Storage } from "../infra/storage/storage";

/** Loads the invented demo scenario when the database holds no workshop yet. Refuses in production. */
export async function seedDemoIfEmpty(
  ds: DataSource,
  opts: { production: boolean; storage?: Storage },
): Promise<boolean> {
  if (opts.production)
    throw new Error(
      "The demo scenario is for development only and will not load in production.",
    );
  if ((await ds.getRepository(Workshop).count()) > 0) return false;
  await loadDemoScenario(ds, localToday("Europe/London"), {
    storage: opts.storage,
  });
  return true;
}
