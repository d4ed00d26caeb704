import { In, type DataSource, type EntityManager } from "typeorm";
import { notFound } from "../http/errors";
import { Booking } from "../modules/bookings/bookings.entity";
import { Job } from "../modules/jobs/jobs.entity";
import { PINNING_STATES } from "../modules/programme/programme-input";
import { TradeMember } from "../modules/trades/trades.entity";

// The locking rule (DEVELOPERS.md, "One version for the whole job"): a change takes, in this
// order, the job's row, then the rows of the trades it may make busy (id order), then any booking
// row. Every lock waits at most LOCK_WAIT_SECONDS (MariaDB's `FOR UPDATE WAIT n`, not the server's
// 50 s innodb_lock_wait_timeout); a request that waits longer, or is picked as a deadlock's
// victim, is answered 409 "busy" by server/http/errors.ts.

/** How long a request waits for another request's row lock before it is refused with 409. */
export const LOCK_WAIT_SECONDS = 5;

/**
 * Runs a change that takes row locks. READ COMMITTED, because under REPEATABLE READ a read after
 * a lock would still see the snapshot taken at the transaction's first read — a booking the
 * previous lock holder committed meanwhile would stay invisible and the trade be double-booked.
 */
export function lockingTransaction<T>(
  ds: DataSource,
  work: (m: EntityManager) => Promise<T>,
): Promise<T> {
  return ds.transaction("READ COMMITTED", work);
}

/**
 * Locks the workshop's row, before any job row: a settings change takes it, then every open job's
 * row (id order), then their trades. Nothing else locks a workshop row, so the order holds.
 */
export async function lockWorkshopRow(
  m: EntityManager,
  workshopId: string,
): Promise<boolean> {
  const rows: unknown[] = await m.query(
    `SELECT id FROM workshops WHERE id = ? FOR UPDATE WAIT ${LOCK_WAIT_SECONDS}`,
    [workshopId],
  );
  return rows.length > 0;
}

/** Locks one job's row (a no-op when the transaction holds it); false when there is no such job. */
export async function lockJobRow(
  m: EntityManager,
  jobId: string,
): Promise<boolean> {
  const rows: unknown[] = await m.query(
    `SELECT id FROM jobs WHERE id = ? FOR UPDATE WAIT ${LOCK_WAIT_SECONDS}`,
    [jobId],
  );
  return rows.length > 0;
}

/** Locks the job's row and returns the job as it stands (404 when there is none). */
export async function lockJob(m: EntityManager, jobId: string): Promise<Job> {
  if (!(await lockJobRow(m, jobId))) throw notFound("That job");
  return m.findOneByOrFail(Job, { id: jobId });
}

/**
 * Locks, after the job's row, the rows of every trade whose slots the change may touch: those
 * booked on the job (a programme change can move them), `also` (the one being booked), and every
 * other trade record of the same people (a trade user linked to several workshops is one person's
 * time). One at a time in id order, so two changes never take two trades in opposite orders.
 */
export async function lockJobTrades(
  m: EntityManager,
  jobId: string | string[],
  also: string[] = [],
): Promise<void> {
  // Several jobs (a workshop settings change re-plans them all): their rows are locked first, by
  // the caller, then every trade of all of them here in one id order.
  const jobIds = Array.isArray(jobId) ? jobId : [jobId];
  if (!jobIds.length && !also.length) return;
  const booked = !jobIds.length
    ? []
    : await m.find(Booking, {
        where: { jobId: In(jobIds), state: In([...PINNING_STATES]) },
        select: { tradeId: true },
      });
  const ids = new Set([...also, ...booked.map((b) => b.tradeId)]);
  if (!ids.size) return;
  const people = await m.find(TradeMember, {
    where: { tradeId: In([...ids]) },
    select: { userId: true },
  });
  if (people.length)
    for (const r of await m.find(TradeMember, {
      where: { userId: In([...new Set(people.map((p) => p.userId))]) },
      select: { tradeId: true },
    }))
      ids.add(r.tradeId);
  for (const id of [...ids].sort())
    await m.query(
      `SELECT id FROM trades WHERE id = ? FOR UPDATE WAIT ${LOCK_WAIT_SECONDS}`,
      [id],
    );
}
