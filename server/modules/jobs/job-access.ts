import { In, type EntityManager } from "typeorm";
import type { JobResource } from "../../policies";
import type { BookingState } from "../../../shared/schemas";
import {
  statesWhere,
  tradeSeesAddress,
} from "../../../shared/bookings/lifecycle";
import { Booking } from "../bookings/bookings.entity";
import type { Job } from "./jobs.entity";

/** Booking states in which the trade is on the job: those that hold their dates (the lifecycle table). */
export const ACTIVE_STATES: BookingState[] = statesWhere("holdsDates");

/**
 * The policy's view of a job: its workshop, customer and the trades booked on it. It reads through
 * the caller's EntityManager: inside a transaction, that transaction's connection (asking the pool
 * for a second one while holding a row lock is how issue 13's burst deadlocked the pool).
 */
export async function jobResource(
  m: EntityManager,
  job: Job,
): Promise<JobResource> {
  return (await jobResources(m, [job])).get(job.id)!;
}

/** `jobResource` for many jobs in one statement (a list never asks per job: issue 15). */
export async function jobResources(
  m: EntityManager,
  jobs: readonly Job[],
): Promise<Map<string, JobResource>> {
  const out = new Map<string, JobResource>();
  if (!jobs.length) return out;
  const bookings = await m.getRepository(Booking).find({
    where: { jobId: In(jobs.map((j) => j.id)) },
    select: { jobId: true, tradeId: true, state: true, shareAddress: true },
  });
  for (const job of jobs) {
    const own = bookings.filter((b) => b.jobId === job.id);
    out.set(job.id, {
      kind: "job",
      workshopId: job.workshopId,
      customerId: job.customerId,
      activeTradeIds: new Set(
        own
          .filter((b) => ACTIVE_STATES.includes(b.state))
          .map((b) => b.tradeId),
      ),
      addressTradeIds: new Set(
        own.filter((b) => tradeSeesAddress(b)).map((b) => b.tradeId),
      ),
    });
  }
  return out;
}
