// One job with a long programme (issue 15: "a 400-task programme is 554 KB"), for the size
// figures and the edit-answer tests: tasks of every party, about 1.5 links a task (a chain plus a
// link back three tasks on every other one, some with lags), and a few booked trade tasks so the
// trades' calendars, resources and busy time are in the engine input too.
import type { DataSource } from "typeorm";
import { newId } from "../../server/db/columns";
import { Booking } from "../../server/modules/bookings/bookings.entity";
import { Customer } from "../../server/modules/customers/customers.entity";
import { Job } from "../../server/modules/jobs/jobs.entity";
import {
  Task,
  TaskLink,
} from "../../server/modules/programme/programme.entity";
import { Trade } from "../../server/modules/trades/trades.entity";
import { Workshop } from "../../server/modules/workshops/workshops.entity";
import type { Party } from "../../shared/schemas";
import { buildJob } from "./builders";
import {
  DEMO_WORKSHOP_NAME,
  demoAccounts,
  weekdaysFrom,
} from "./demo-scenario";

export const bigProgrammeTitle = (n: number) =>
  `Whole-house joinery, ${n} tasks`;

const PARTIES: Party[] = [
  "workshop",
  "electrician",
  "workshop",
  "plasterer",
  "workshop",
  "decorator",
];

/** Adds a job of `n` tasks to the demo workshop (already loaded); returns the job. */
export async function buildBigProgramme(
  ds: DataSource,
  today: string,
  n: number,
): Promise<Job> {
  return ds.transaction(async (m) => {
    const workshop = await m.findOneByOrFail(Workshop, {
      name: DEMO_WORKSHOP_NAME,
    });
    const customer = await m.findOneByOrFail(Customer, {
      email: demoAccounts.customer.email,
    });
    const trades = {
      electrician: await m.findOneByOrFail(Trade, {
        workshopId: workshop.id,
        businessName: "Brightwire Electrical",
      }),
      plasterer: await m.findOneByOrFail(Trade, {
        workshopId: workshop.id,
        businessName: "Ashby Plaster & Coving",
      }),
      decorator: await m.findOneByOrFail(Trade, {
        workshopId: workshop.id,
        businessName: "Kestrel Decorating",
      }),
    };
    const job = await buildJob(m, workshop, customer, {
      title: bigProgrammeTitle(n),
      status: "planned",
      handoverDate: weekdaysFrom(today, Math.ceil(n * 1.5)),
    });
    // Plain rows with their ids fixed here: TypeORM's bulk insert may reorder the entity array.
    const tasks: Array<Partial<Task> & { id: string; party: Party }> = [];
    for (let i = 0; i < n; i++) {
      const party = PARTIES[i % PARTIES.length];
      tasks.push({
        id: newId(),
        workshopId: workshop.id,
        jobId: job.id,
        name: `${party === "workshop" ? "Fit" : "Trade visit"} ${i + 1}: room ${Math.floor(i / 6) + 1}`,
        party,
        durationDays: String([0.5, 1, 2, 1.5][i % 4]),
        notEarlierThan: null,
        actualStart: null,
        actualFinish: null,
        customerNote: i % 5 === 0 ? "We will need the room clear." : "",
        internalNote: i % 7 === 0 ? "Check the wall is true first." : "",
        hazards: party === "electrician" ? ["electrical"] : [],
        sortOrder: i + 1,
      });
    }
    await m.insert(
      Task,
      tasks.map((row) => ({ ...row })),
    );
    const links: Array<Partial<TaskLink>> = [];
    const link = (
      from: { id: string },
      to: { id: string },
      lag = 0,
      hours = false,
    ) =>
      links.push({
        id: newId(),
        workshopId: workshop.id,
        jobId: job.id,
        fromTaskId: from.id,
        toTaskId: to.id,
        kind: "FS",
        lag: String(lag),
        lagUnit: hours ? "elapsedHours" : "workingDays",
      });
    for (let i = 1; i < n; i++) {
      // Paint waits 24 hours (drying) for what comes before it.
      const drying = tasks[i].party === "decorator";
      link(tasks[i - 1], tasks[i], drying ? 24 : 0, drying);
      if (i >= 3 && i % 2 === 0) link(tasks[i - 3], tasks[i]);
    }
    await m.insert(TaskLink, links);
    // The first trade task of each kind is booked (confirmed), so its trade's calendar is in play.
    const booked = new Set<string>();
    const bookings: Array<Partial<Booking>> = [];
    for (const task of tasks) {
      if (task.party === "workshop" || booked.has(task.party)) continue;
      booked.add(task.party);
      const trade = trades[task.party as keyof typeof trades];
      const day = weekdaysFrom(today, 10 + bookings.length);
      bookings.push({
        id: newId(),
        workshopId: workshop.id,
        jobId: job.id,
        taskId: task.id,
        tradeId: trade.id,
        state: "confirmed",
        start: `${day}T08:00`,
        finish: `${day}T16:30`,
        arrivalWindow: "all-day",
        arrivalFrom: null,
        arrivalTo: null,
        icalUid: newId(),
        sequence: 0,
        sentAt: new Date(),
      });
    }
    await m.insert(Booking, bookings);
    return job;
  });
}
