import { zonedFormatter } from "../jobs/jobs.presenter";
import type { Request, Response } from "express";
import { In, type DataSource, type EntityManager } from "typeorm";
import type { z } from "zod";
import {
  postMessageFieldsSchema,
  THREAD_MAX_FILES,
  threadAudienceLabels,
  type MarkReadResponse,
  type ThreadAudience,
  type ThreadMessage as ThreadMessageView,
  type ThreadResponse,
  type UnreadResponse,
  type threadAttachmentQuerySchema,
  type threadQuerySchema,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { forbidden, HttpError, notFound } from "../../http/errors";
import { assertWorkshopMaySend, enqueueMail } from "../../infra/outbox/outbox";
import {
  authorize,
  can,
  requireActor,
  threadAudiencesFor,
  type Actor,
  type JobResource,
} from "../../policies";
import { Booking } from "../bookings/bookings.entity";
import { Customer } from "../customers/customers.entity";
import { StoredFile } from "../files/files.entity";
import {
  deleteStoredFiles,
  receiveUploads,
  sendStoredFile,
  type FilesDeps,
} from "../files/files.service";
import { ACTIVE_STATES, jobResource, jobResources } from "../jobs/job-access";
import { Job } from "../jobs/jobs.entity";
import { TradeMember, Trade } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { loadSessionUser } from "../users/users.service";
import { WorkshopMember } from "../workshops/workshops.entity";
import { insertThreadMessage } from "./thread-notes";
import {
  ThreadAttachment,
  ThreadMessage,
  ThreadNotice,
  ThreadRead,
  type ThreadAuthorRole,
} from "./thread.entity";
import { presentMessage } from "./thread.presenter";

export interface ThreadDeps {
  ds: DataSource;
  /** Where the job page lives, for the link in notice e-mails. */
  appUrl: string;
  files: FilesDeps;
  /** How long after the first unnoticed message a person's notice e-mail goes out (batching). */
  noticeDelayMs: number;
}

/** 5 minutes: messages written within one window reach each person in one e-mail. */
export const DEFAULT_NOTICE_DELAY_MS = 5 * 60 * 1000;

interface ThreadJob {
  job: Job;
  resource: JobResource;
  audiences: ThreadAudience[];
}

/** The job and what this person sees of its thread; 404 when they see none of it. */
async function loadThreadJob(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
): Promise<ThreadJob & { actor: Actor }> {
  requireActor(actor);
  const job = await ds.manager.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  const resource = await jobResource(ds.manager, job);
  const audiences = threadAudiencesFor(actor, resource);
  // Nobody who sees the job lacks "Whole job", so this throws 404 for everyone else.
  if (!audiences.length) authorize(actor, "thread.audience.job", resource);
  return { job, resource, audiences, actor };
}

async function readPosition(
  m: EntityManager,
  userId: string,
  jobId: string,
): Promise<number> {
  const row = await m.findOneBy(ThreadRead, { userId, jobId });
  return row ? Number(row.lastReadSeq) : 0;
}

/** Messages of the given audiences after `lastReadSeq` that someone else wrote. */
async function countUnread(
  m: EntityManager,
  userId: string,
  jobId: string,
  audiences: ThreadAudience[],
  lastReadSeq: number,
): Promise<number> {
  if (!audiences.length) return 0;
  return m
    .createQueryBuilder(ThreadMessage, "t")
    .where("t.jobId = :jobId", { jobId })
    .andWhere("t.audience IN (:...audiences)", { audiences })
    .andWhere("t.seq > :seq", { seq: lastReadSeq })
    .andWhere("(t.authorUserId IS NULL OR t.authorUserId <> :userId)", {
      userId,
    })
    .getCount();
}

/** The stored files of each message, in the order they were attached. */
async function filesOf(
  m: EntityManager,
  messages: ThreadMessage[],
): Promise<Map<string, StoredFile[]>> {
  const bySeq = new Map<string, StoredFile[]>(messages.map((x) => [x.seq, []]));
  if (!messages.length) return bySeq;
  const rows = await m.find(ThreadAttachment, {
    where: { messageSeq: In(messages.map((x) => x.seq)) },
    relations: { file: true },
    order: { position: "ASC" },
  });
  for (const r of rows) if (r.file) bySeq.get(r.messageSeq)?.push(r.file);
  return bySeq;
}

/** The thread as one person sees it: their audiences, the messages (all latest, or only new ones after a cursor), their unread markers. */
export async function getThread(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  query: z.output<typeof threadQuerySchema>,
): Promise<ThreadResponse> {
  const { job, audiences, actor: a } = await loadThreadJob(ds, actor, jobId);
  const m = ds.manager;
  const q = m
    .createQueryBuilder(ThreadMessage, "t")
    .where("t.jobId = :jobId", { jobId: job.id })
    .andWhere("t.audience IN (:...audiences)", { audiences });
  if (query.after !== undefined)
    q.andWhere("t.seq > :after", { after: query.after });
  if (query.before !== undefined)
    q.andWhere("t.seq < :before", { before: query.before });
  // New messages after a cursor come oldest first; otherwise the latest page, then put in order.
  const ascending = query.after !== undefined;
  const rows = await q
    .orderBy("t.seq", ascending ? "ASC" : "DESC")
    .limit(query.limit)
    .getMany();
  if (!ascending) rows.reverse();
  const first = rows[0] ? Number(rows[0].seq) : null;
  const bound =
    first ?? (query.after !== undefined ? query.after + 1 : query.before);
  const hasEarlier =
    bound !== undefined &&
    (await m
      .createQueryBuilder(ThreadMessage, "t")
      .where("t.jobId = :jobId", { jobId: job.id })
      .andWhere("t.audience IN (:...audiences)", { audiences })
      .andWhere("t.seq < :bound", { bound })
      .getExists());
  const lastReadSeq = await readPosition(m, a.userId, job.id);
  const files = await filesOf(m, rows);
  const messages = rows.map((r) =>
    presentMessage(r, files.get(r.seq) ?? [], {
      userId: a.userId,
      lastReadSeq,
    }),
  );
  return {
    jobId: job.id,
    visibleAudiences: audiences,
    audiences,
    messages,
    hasEarlier,
    cursor: Math.max(query.after ?? 0, ...messages.map((x) => x.seq)),
    lastReadSeq,
    unreadCount: await countUnread(m, a.userId, job.id, audiences, lastReadSeq),
  };
}

/** How the author appears on the thread: the workshop first, then the trade on this job, then the customer. */
async function authorFor(
  m: EntityManager,
  actor: Actor,
  t: ThreadJob,
): Promise<{
  userId: string;
  name: string;
  label: string;
  role: ThreadAuthorRole;
}> {
  const user = await m.findOneByOrFail(User, { id: actor.userId });
  const base = { userId: user.id, name: user.name };
  if (actor.memberships.has(t.job.workshopId))
    return { ...base, label: "Workshop", role: "workshop" };
  const tradeId = [...actor.trades.entries()].find(
    ([id, ws]) => ws === t.job.workshopId && t.resource.activeTradeIds.has(id),
  )?.[0];
  if (tradeId) {
    const trade = await m.findOneByOrFail(Trade, { id: tradeId });
    return { ...base, label: trade.businessName, role: "trade" };
  }
  return { ...base, label: "Customer", role: "customer" };
}

function refuseAudience(t: ThreadJob, audience: ThreadAudience): never {
  const allowed = t.audiences.map((x) => `"${threadAudienceLabels[x]}"`);
  throw forbidden(
    `You cannot post to "${threadAudienceLabels[audience]}" on this job; you can post to ${allowed.join(" or ")}.`,
  );
}

/** The people who see an audience of the job and have an account: the workshop, the trades on the job, the customer — each checked by the policy. */
async function recipientsFor(
  m: EntityManager,
  t: ThreadJob,
  audience: ThreadAudience,
): Promise<string[]> {
  const [members, tradeMembers, customer] = await Promise.all([
    m.findBy(WorkshopMember, { workshopId: t.job.workshopId }),
    t.resource.activeTradeIds.size
      ? m.findBy(TradeMember, { tradeId: In([...t.resource.activeTradeIds]) })
      : Promise.resolve([]),
    m.findOneBy(Customer, { id: t.job.customerId }),
  ]);
  const candidates = new Set<string>([
    ...members.map((x) => x.userId),
    ...tradeMembers.map((x) => x.userId),
    ...(customer?.userId ? [customer.userId] : []),
  ]);
  const out: string[] = [];
  for (const userId of candidates) {
    const loaded = await loadSessionUser(m, userId);
    if (loaded && can(loaded.actor, `thread.audience.${audience}`, t.resource))
      out.push(userId);
  }
  return out;
}

/** Owes each recipient a notice: the first message of a window sets `dueAt`; later ones join it. */
async function scheduleNotices(
  m: EntityManager,
  deps: Pick<ThreadDeps, "noticeDelayMs">,
  t: ThreadJob,
  audience: ThreadAudience,
  authorUserId: string,
  now: Date,
): Promise<void> {
  const due = new Date(now.getTime() + deps.noticeDelayMs);
  const others = (await recipientsFor(m, t, audience)).filter(
    (userId) => userId !== authorUserId,
  );
  // A message that will be e-mailed to someone is refused (and rolled back) while the workshop's
  // owners have not verified their address; one with nobody to tell is a note to themselves.
  if (others.length) await assertWorkshopMaySend(m, t.job.workshopId);
  for (const userId of others) {
    await m.query(
      "INSERT INTO `thread_notices` (`id`, `userId`, `jobId`, `dueAt`, `lastNoticedSeq`) VALUES (?, ?, ?, ?, 0) " +
        "ON DUPLICATE KEY UPDATE `dueAt` = COALESCE(`dueAt`, VALUES(`dueAt`))",
      [newId(), userId, t.job.id, due],
    );
  }
}

async function writeMessage(
  deps: ThreadDeps,
  t: ThreadJob & { actor: Actor },
  body: { audience: ThreadAudience; text: string },
  files: StoredFile[],
): Promise<ThreadMessageView> {
  const { ds } = deps;
  const msg = await ds.transaction(async (m) => {
    const author = await authorFor(m, t.actor, t);
    const inserted = await insertThreadMessage(m, {
      workshopId: t.job.workshopId,
      jobId: t.job.id,
      audience: body.audience,
      kind: "message",
      text: body.text,
      author,
    });
    for (const [position, f] of files.entries())
      await m.insert(ThreadAttachment, {
        id: newId(),
        messageSeq: inserted.seq,
        fileId: f.id,
        position,
      });
    await scheduleNotices(
      m,
      deps,
      t,
      body.audience,
      t.actor.userId,
      new Date(),
    );
    return inserted;
  });
  return presentMessage(msg, files, {
    userId: t.actor.userId,
    lastReadSeq: await readPosition(ds.manager, t.actor.userId, t.job.id),
  });
}

/** A text message (JSON, no files). */
export async function postMessage(
  deps: ThreadDeps,
  actor: Actor | null,
  jobId: string,
  body: { audience: ThreadAudience; text: string },
): Promise<ThreadMessageView> {
  const t = await loadThreadJob(deps.ds, actor, jobId);
  if (!t.audiences.includes(body.audience)) refuseAudience(t, body.audience);
  return writeMessage(deps, t, body, []);
}

/** A message with files (multipart): the files go through the one upload path; any refusal removes them again. */
export async function postMessageWithFiles(
  deps: ThreadDeps,
  actor: Actor | null,
  jobId: string,
  req: Request,
  res: Response,
): Promise<ThreadMessageView> {
  const t = await loadThreadJob(deps.ds, actor, jobId);
  const { files, fields } = await receiveUploads(deps.files, req, res, {
    workshopId: t.job.workshopId,
    userId: t.actor.userId,
    fields: postMessageFieldsSchema,
    maxFiles: THREAD_MAX_FILES,
    required: true,
  });
  try {
    if (!t.audiences.includes(fields.audience))
      refuseAudience(t, fields.audience);
    return await writeMessage(deps, t, fields, files);
  } catch (err) {
    await deleteStoredFiles(deps.files, files);
    throw err;
  }
}

/** Sets the person's read position (never backwards, never past what they can see now). */
export async function markRead(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  seq: number | undefined,
): Promise<MarkReadResponse> {
  const { job, audiences, actor: a } = await loadThreadJob(ds, actor, jobId);
  const m = ds.manager;
  const latest = await m
    .createQueryBuilder(ThreadMessage, "t")
    .select("MAX(t.seq)", "max")
    .where("t.jobId = :jobId", { jobId: job.id })
    .andWhere("t.audience IN (:...audiences)", { audiences })
    .getRawOne<{ max: string | null }>();
  const upTo = Math.min(seq ?? Infinity, Number(latest?.max ?? 0));
  await m.query(
    "INSERT INTO `thread_reads` (`id`, `userId`, `jobId`, `lastReadSeq`) VALUES (?, ?, ?, ?) " +
      "ON DUPLICATE KEY UPDATE `lastReadSeq` = GREATEST(`lastReadSeq`, VALUES(`lastReadSeq`))",
    [newId(), a.userId, job.id, upTo],
  );
  const lastReadSeq = await readPosition(m, a.userId, job.id);
  return {
    lastReadSeq,
    unreadCount: await countUnread(m, a.userId, job.id, audiences, lastReadSeq),
  };
}

/** The signed-in person's jobs with unread thread messages, newest first. */
export async function unreadSummary(
  ds: DataSource,
  actor: Actor | null,
): Promise<UnreadResponse> {
  requireActor(actor);
  const m = ds.manager;
  // Candidate jobs: every job of a workshop they belong to, jobs their trades are booked on, their own jobs.
  const memberWs = [...actor.memberships.keys()];
  const tradeIds = [...actor.trades.keys()];
  const customerIds = [...actor.customers.keys()];
  const [wsJobs, bookedJobs, ownJobs] = await Promise.all([
    memberWs.length ? m.findBy(Job, { workshopId: In(memberWs) }) : [],
    tradeIds.length
      ? m
          .createQueryBuilder(Job, "j")
          .innerJoin(Booking, "b", "b.jobId = j.id")
          .where("b.tradeId IN (:...tradeIds)", { tradeIds })
          .andWhere("b.state IN (:...states)", { states: ACTIVE_STATES })
          .getMany()
      : [],
    customerIds.length ? m.findBy(Job, { customerId: In(customerIds) }) : [],
  ]);
  const jobs = new Map<string, Job>();
  for (const j of [...wsJobs, ...bookedJobs, ...ownJobs]) jobs.set(j.id, j);
  if (!jobs.size) return { total: 0, jobs: [] };
  const resources = await jobResources(m, [...jobs.values()]);
  // Group the jobs by the audiences the policy gives this person there; one count query per group.
  const groups = new Map<
    string,
    { audiences: ThreadAudience[]; jobIds: string[] }
  >();
  for (const job of jobs.values()) {
    const resource = resources.get(job.id)!;
    const audiences = threadAudiencesFor(actor, resource);
    if (!audiences.length) continue;
    const key = audiences.join(",");
    const g = groups.get(key) ?? { audiences, jobIds: [] };
    g.jobIds.push(job.id);
    groups.set(key, g);
  }
  const out: UnreadResponse["jobs"] = [];
  for (const g of groups.values()) {
    const rows = await m
      .createQueryBuilder(ThreadMessage, "t")
      .leftJoin(ThreadRead, "r", "r.jobId = t.jobId AND r.userId = :userId", {
        userId: actor.userId,
      })
      .select("t.jobId", "jobId")
      .addSelect("COUNT(*)", "unread")
      .addSelect("MAX(t.createdAt)", "latestAt")
      .where("t.jobId IN (:...jobIds)", { jobIds: g.jobIds })
      .andWhere("t.audience IN (:...audiences)", { audiences: g.audiences })
      .andWhere("t.seq > COALESCE(r.lastReadSeq, 0)")
      .andWhere("(t.authorUserId IS NULL OR t.authorUserId <> :userId)", {
        userId: actor.userId,
      })
      .groupBy("t.jobId")
      .getRawMany<{ jobId: string; unread: string; latestAt: Date | string }>();
    for (const r of rows)
      out.push({
        jobId: r.jobId,
        jobTitle: jobs.get(r.jobId)?.title ?? "",
        unreadCount: Number(r.unread),
        latestAt: new Date(r.latestAt).toISOString(),
      });
  }
  out.sort((a, b) => b.latestAt.localeCompare(a.latestAt));
  return { total: out.reduce((n, j) => n + j.unreadCount, 0), jobs: out };
}

/** Streams an attachment after checking the person sees the message carrying it (404 otherwise, even with the id). */
export async function sendAttachment(
  deps: ThreadDeps,
  actor: Actor | null,
  jobId: string,
  fileId: string,
  query: z.output<typeof threadAttachmentQuerySchema>,
  res: Response,
): Promise<void> {
  const { job, audiences } = await loadThreadJob(deps.ds, actor, jobId);
  const row = await deps.ds.manager
    .createQueryBuilder(ThreadAttachment, "a")
    .innerJoinAndSelect("a.message", "t")
    .innerJoinAndSelect("a.file", "f")
    .where("a.fileId = :fileId", { fileId })
    .andWhere("t.jobId = :jobId", { jobId: job.id })
    .getOne();
  if (!row?.message || !row.file || !audiences.includes(row.message.audience))
    throw notFound("That file");
  if (query.variant === "thumbnail" && !row.file.thumbnailKey)
    throw new HttpError(404, "not-found", "That file has no preview.");
  await sendStoredFile(deps.files, res, row.file, {
    variant: query.variant,
    inline: query.inline,
  });
}

const noticeTime = (timeZone: string, at: Date) =>
  zonedFormatter("en-GB", {
    timeZone,
    weekday: "short",
    day: "numeric",
    month: "short",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  })
    .format(at)
    .replace(",", "");

/** Most messages written out in one notice e-mail; the rest are counted. */
const NOTICE_MAX_MESSAGES = 20;

/**
 * Sends the thread notices that are due (each process runs this every minute). A notice is
 * claimed by the UPDATE that clears its `dueAt`, inside the transaction that queues its e-mail,
 * so two processes never both send it. One e-mail per person per job lists the messages since
 * their last notice that they can see (by the policy, as it stands now) and have not read; if
 * they read everything meanwhile, nothing is sent. System notes never cause or fill a notice.
 */
export async function sendThreadNotices(
  deps: Pick<ThreadDeps, "ds" | "appUrl">,
  now = new Date(),
): Promise<number> {
  const { ds } = deps;
  const due = await ds
    .getRepository(ThreadNotice)
    .createQueryBuilder("n")
    .where("n.dueAt <= :now", { now })
    .orderBy("n.dueAt", "ASC")
    .limit(500)
    .getMany();
  let sent = 0;
  for (const d of due) {
    const queued = await ds.transaction(async (m) => {
      const claim = await m
        .createQueryBuilder()
        .update(ThreadNotice)
        .set({ dueAt: null })
        .where("id = :id AND dueAt IS NOT NULL AND dueAt <= :now", {
          id: d.id,
          now,
        })
        .execute();
      if (claim.affected !== 1) return false;
      const notice = await m.findOneByOrFail(ThreadNotice, { id: d.id });
      const [job, loaded] = await Promise.all([
        m.findOneBy(Job, { id: notice.jobId }),
        loadSessionUser(m, notice.userId),
      ]);
      if (!job || !loaded) return false;
      const audiences = threadAudiencesFor(
        loaded.actor,
        await jobResource(m, job),
      );
      if (!audiences.length) return false;
      const from = Math.max(
        Number(notice.lastNoticedSeq),
        await readPosition(m, notice.userId, job.id),
      );
      const q = m
        .createQueryBuilder(ThreadMessage, "t")
        .where("t.jobId = :jobId", { jobId: job.id })
        .andWhere("t.kind = 'message'")
        .andWhere("t.audience IN (:...audiences)", { audiences })
        .andWhere("t.seq > :from", { from })
        .andWhere("(t.authorUserId IS NULL OR t.authorUserId <> :userId)", {
          userId: notice.userId,
        })
        .orderBy("t.seq", "ASC");
      const total = await q.getCount();
      if (!total) return false;
      const messages = await q.limit(NOTICE_MAX_MESSAGES).getMany();
      const attached = await filesOf(m, messages);
      const lastSeq = (
        await m
          .createQueryBuilder(ThreadMessage, "t")
          .select("MAX(t.seq)", "max")
          .where("t.jobId = :jobId", { jobId: job.id })
          .andWhere("t.audience IN (:...audiences)", { audiences })
          .getRawOne<{ max: string }>()
      )?.max;
      await m.update(
        ThreadNotice,
        { id: notice.id },
        { lastNoticedSeq: lastSeq ?? notice.lastNoticedSeq, lastSentAt: now },
      );
      const lines = messages.map((x) => {
        const files = attached.get(x.seq)?.length ?? 0;
        const head = `${x.authorName ?? "Someone"} (${x.authorLabel ?? ""}) · ${noticeTime(job.timeZone, x.createdAt)} · ${threadAudienceLabels[x.audience]}`;
        const body = x.text || "(no text)";
        const extra = files
          ? `\n[${files} file${files === 1 ? "" : "s"} attached]`
          : "";
        return `${head}\n${body}${extra}`;
      });
      const more =
        total > messages.length
          ? `\n\n…and ${total - messages.length} more in the thread.`
          : "";
      const url = `${deps.appUrl}/jobs/${job.id}`;
      await enqueueMail(m, {
        workshopId: job.workshopId,
        to: loaded.user.email,
        subject: `${total === 1 ? "New message" : `${total} new messages`} on ${job.title}`,
        // Plain text only: message text is the person's own words, never rendered as HTML.
        text: `Hello ${loaded.user.name},\n\n${total === 1 ? "There is a new message" : `There are ${total} new messages`} in the thread for ${job.title}:\n\n${lines.join("\n\n")}${more}\n\nOpen the job to reply: ${url}\n`,
      });
      return true;
    });
    if (queued) sent++;
  }
  return sent;
}
