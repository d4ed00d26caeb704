import type { DataSource } from "typeorm";
import type { JobResource } from "../../policies";
import type { BookingState } from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import type { Job } from "./jobs.entity";

/** Booking states in which the trade has been asked and the visit stands. */
export const ACTIVE_STATES: BookingState[] = [
  "sent",
  "confirmed",
  "date-proposed",
  "needs-reconfirming",
];

/** The policy's view of a job: its workshop, customer and the trades booked on it. */
export async function jobResource(
  ds: DataSource,
  job: Job,
): Promise<JobResource> {
  const bookings = await ds
    .getRepository(Booking)
    .find({ where: { jobId: job.id }, select: { tradeId: true, state: true } });
  return {
    kind: "job",
    workshopId: job.workshopId,
    customerId: job.customerId,
    activeTradeIds: new Set(
      bookings
        .filter((b) => ACTIVE_STATES.includes(b.state))
        .map((b) => b.tradeId),
    ),
    confirmedTradeIds: new Set(
      bookings.filter((b) => b.state === "confirmed").map((b) => b.tradeId),
    ),
  };
}
