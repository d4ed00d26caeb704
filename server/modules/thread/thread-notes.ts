import type { EntityManager } from "typeorm";
import type { ThreadAudience } from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { lockJobRow } from "../../db/locks";
import type { Job } from "../jobs/jobs.entity";
import {
  ThreadMessage,
  type ThreadAuthorRole,
  type ThreadMessageKind,
} from "./thread.entity";

// The low-level writer of thread messages, kept free of other services so bookings and the
// programme can post their system notes inside their own transactions without import cycles.

export interface NewThreadMessage {
  workshopId: string;
  jobId: string;
  audience: ThreadAudience;
  kind: ThreadMessageKind;
  text: string;
  author: {
    userId: string;
    name: string;
    label: string;
    role: ThreadAuthorRole;
  } | null;
}

/**
 * Inserts one message in the caller's transaction. The job row is locked first (a no-op when the
 * transaction holds it already), so two messages of one job never get their AUTO_INCREMENT `seq`
 * in one order and commit in the other — which would let a poll's `after` cursor skip one.
 */
export async function insertThreadMessage(
  m: EntityManager,
  msg: NewThreadMessage,
): Promise<ThreadMessage> {
  // Waits at most LOCK_WAIT_SECONDS, like every lock on a job's row (server/db/locks.ts).
  await lockJobRow(m, msg.jobId);
  const id = newId();
  const res = await m.insert(ThreadMessage, {
    id,
    workshopId: msg.workshopId,
    jobId: msg.jobId,
    audience: msg.audience,
    kind: msg.kind,
    text: msg.text,
    authorUserId: msg.author?.userId ?? null,
    authorName: msg.author?.name ?? null,
    authorLabel: msg.author?.label ?? null,
    authorRole: msg.author?.role ?? null,
  });
  const seq = String(res.identifiers[0]?.seq ?? res.raw.insertId);
  return m.findOneByOrFail(ThreadMessage, { seq });
}

/**
 * A note Sitecue writes when a booking or task changes (author null). The caller picks the
 * audience (see DEVELOPERS.md, "Thread system notes"); the text never carries a trade's contact
 * details or anyone's internal notes. System notes send no e-mail notice of their own.
 */
export async function postSystemNote(
  m: EntityManager,
  job: Pick<Job, "id" | "workshopId">,
  audience: ThreadAudience,
  text: string,
): Promise<void> {
  await insertThreadMessage(m, {
    workshopId: job.workshopId,
    jobId: job.id,
    audience,
    kind: "system",
    text,
    author: null,
  });
}

const noteDayFormat = new Intl.DateTimeFormat("en-GB", {
  weekday: "short",
  day: "numeric",
  month: "short",
  timeZone: "UTC",
});

/** "Thu 5 Mar" for a local date or date-time (wall-clock strings, so formatted as UTC). */
export function noteDay(local: string): string {
  return noteDayFormat
    .format(new Date(`${local.slice(0, 10)}T12:00:00Z`))
    .replace(",", "");
}
