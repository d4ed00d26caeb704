import { In, type DataSource } from "typeorm";
import type { Actor } from "../../policies";
import { authorize, can, requireActor } from "../../policies";
import { newId } from "../../db/columns";
import { HttpError, notFound } from "../../http/errors";
import { audit } from "../audit/audit.service";
import { Booking } from "../bookings/bookings.entity";
import { Customer } from "../customers/customers.entity";
import { Task, TaskLink } from "../programme/programme.entity";
import { Trade } from "../trades/trades.entity";
import { Workshop } from "../workshops/workshops.entity";
import { Job } from "./jobs.entity";
import { StoredFile } from "../files/files.entity";
import { deleteStoredFiles, type FilesDeps } from "../files/files.service";
import { ACTIVE_STATES, jobResource } from "./job-access";
import { applyStarter } from "../starters/starters.service";
import {
  presentJobDetail,
  presentJobSummary,
  viewerRoleFor,
} from "./jobs.presenter";
import type { JobDetail, JobSummary } from "../../../shared/schemas";
import type { z } from "zod";
import type {
  createJobBodySchema,
  updateJobBodySchema,
} from "../../../shared/schemas";

async function loadJob(ds: DataSource, jobId: string): Promise<Job> {
  const job = await ds.getRepository(Job).findOneBy({ id: jobId });
  if (!job) throw notFound("That job");
  return job;
}

/** Every job the actor may see, each with its next event. */
export async function listJobs(
  ds: DataSource,
  actor: Actor | null,
): Promise<JobSummary[]> {
  requireActor(actor);
  const memberWorkshops = [...actor.memberships.keys()];
  const tradeIds = [...actor.trades.keys()];
  const customerIds = [...actor.customers.keys()];
  const jobIds = new Set<string>();
  const jobs: Job[] = [];
  const add = (list: Job[]) =>
    list.forEach((j) => !jobIds.has(j.id) && (jobIds.add(j.id), jobs.push(j)));
  if (memberWorkshops.length)
    add(
      await ds.getRepository(Job).findBy({ workshopId: In(memberWorkshops) }),
    );
  if (customerIds.length)
    add(await ds.getRepository(Job).findBy({ customerId: In(customerIds) }));
  if (tradeIds.length) {
    const booked = await ds
      .getRepository(Booking)
      .findBy({ tradeId: In(tradeIds), state: In(ACTIVE_STATES) });
    const ids = [...new Set(booked.map((b) => b.jobId))].filter(
      (id) => !jobIds.has(id),
    );
    if (ids.length) add(await ds.getRepository(Job).findBy({ id: In(ids) }));
  }
  if (!jobs.length) return [];
  const ids = jobs.map((j) => j.id);
  const [workshops, customers, bookings, tasks, trades] = await Promise.all([
    ds
      .getRepository(Workshop)
      .findBy({ id: In([...new Set(jobs.map((j) => j.workshopId))]) }),
    ds
      .getRepository(Customer)
      .findBy({ id: In([...new Set(jobs.map((j) => j.customerId))]) }),
    ds
      .getRepository(Booking)
      .findBy({ jobId: In(ids), state: In(ACTIVE_STATES) }),
    ds.getRepository(Task).find({
      where: { jobId: In(ids) },
      select: { id: true, name: true, party: true },
    }),
    ds.getRepository(Trade).find({
      where: { workshopId: In([...new Set(jobs.map((j) => j.workshopId))]) },
      select: { id: true, businessName: true, kind: true },
    }),
  ]);
  const byId = <T extends { id: string }>(xs: T[]) =>
    new Map(xs.map((x) => [x.id, x]));
  const ws = byId(workshops),
    cs = byId(customers),
    ts = byId(tasks),
    trs = byId(trades);
  return jobs
    .map((job) => {
      const role = viewerRoleFor(actor, job);
      const visible = bookings.filter(
        (b) =>
          b.jobId === job.id &&
          (role !== "trade" || actor.trades.has(b.tradeId)),
      );
      return presentJobSummary(job, {
        role,
        workshopName: ws.get(job.workshopId)?.name ?? "",
        customerName:
          role === "trade" ? null : (cs.get(job.customerId)?.name ?? null),
        bookings: visible,
        tasks: ts,
        trades: trs,
      });
    })
    .sort(
      (a, b) =>
        (a.nextEvent?.date ?? "9999").localeCompare(
          b.nextEvent?.date ?? "9999",
        ) || a.title.localeCompare(b.title),
    );
}

/** One job as the actor may see it (404 if they may not see it at all). */
export async function getJob(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
): Promise<JobDetail> {
  requireActor(actor);
  const job = await loadJob(ds, jobId);
  const resource = await jobResource(ds.manager, job);
  authorize(actor, "job.read", resource);
  const [workshop, customer, tasks, links, bookings] = await Promise.all([
    ds.getRepository(Workshop).findOneByOrFail({ id: job.workshopId }),
    ds.getRepository(Customer).findOneByOrFail({ id: job.customerId }),
    ds
      .getRepository(Task)
      .find({ where: { jobId }, order: { sortOrder: "ASC" } }),
    ds.getRepository(TaskLink).findBy({ jobId }),
    ds
      .getRepository(Booking)
      .find({ where: { jobId }, order: { start: "ASC" } }),
  ]);
  const trades = bookings.length
    ? await ds
        .getRepository(Trade)
        .findBy({ id: In([...new Set(bookings.map((b) => b.tradeId))]) })
    : [];
  return presentJobDetail(job, {
    actor,
    full: can(actor, "job.readFull", resource),
    address: can(actor, "job.readAddress", resource),
    role: viewerRoleFor(actor, job),
    workshop,
    customer,
    tasks,
    links,
    bookings,
    trades,
  });
}

/** Creates a job for one of the workshop's customers. */
export async function createJob(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof createJobBodySchema>,
): Promise<JobDetail> {
  authorize(actor, "jobs.create", { kind: "workshop", workshopId });
  const customer = await ds
    .getRepository(Customer)
    .findOneBy({ id: body.customerId, workshopId });
  if (!customer)
    throw new HttpError(
      422,
      "unprocessable",
      "That customer is not one of this workshop's.",
      { customerId: ["Choose one of the workshop's customers"] },
    );
  const id = newId();
  const { starterId, ...fields } = body;
  const workshop = await ds
    .getRepository(Workshop)
    .findOneByOrFail({ id: workshopId });
  await ds.transaction(async (m) => {
    await m.insert(Job, {
      id,
      workshopId,
      ...fields,
      // Left out, they come from the workshop's settings (issue 14), not a fixed Mon–Fri.
      siteWeekdays: fields.siteWeekdays ?? workshop.siteWeekdays,
      timeZone: fields.timeZone ?? workshop.timeZone,
      siteClosedDates: [],
      version: 1,
    });
    if (starterId)
      await applyStarter(m, await m.findOneByOrFail(Job, { id }), starterId);
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "job.created",
      entityType: "job",
      entityId: id,
      detail: { title: body.title },
    });
  });
  return getJob(ds, actor, id);
}

/** Edits a job's details; a stale `version` is refused with 409. */
export async function updateJob(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  body: z.output<typeof updateJobBodySchema>,
): Promise<JobDetail> {
  requireActor(actor);
  const job = await loadJob(ds, jobId);
  authorize(actor, "job.update", await jobResource(ds.manager, job));
  const { version, ...changes } = body;
  await ds.transaction(async (m) => {
    // Optimistic lock: the UPDATE matches only the version the editor saw.
    const result = await m
      .createQueryBuilder()
      .update(Job)
      .set({ ...changes, version: () => "version + 1" })
      .where("id = :id AND version = :version", { id: jobId, version })
      .execute();
    if (result.affected !== 1) {
      const current = await m.findOneByOrFail(Job, { id: jobId });
      throw new HttpError(
        409,
        "version-conflict",
        `Someone else changed this job (now version ${current.version}, you had ${version}). Reload to see their changes, then try again.`,
      );
    }
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor.userId,
      action: "job.updated",
      entityType: "job",
      entityId: jobId,
      detail: { changes, fromVersion: version },
    });
  });
  return getJob(ds, actor, jobId);
}

/** Deletes a job and everything in it (owner only). */
export async function deleteJob(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  files?: FilesDeps,
): Promise<void> {
  requireActor(actor);
  const job = await loadJob(ds, jobId);
  authorize(actor, "job.delete", await jobResource(ds.manager, job));
  // The job's drawings and thread attachments go with it (foreign keys cascade); their files are
  // rows and bucket objects of their own, removed once the deletion has committed.
  const fileIds: { fileId: string }[] = await ds.query(
    "SELECT r.fileId FROM drawing_revisions r JOIN drawings d ON d.id = r.drawingId WHERE d.jobId = ? " +
      "UNION SELECT a.fileId FROM thread_attachments a JOIN thread_messages t ON t.seq = a.messageSeq WHERE t.jobId = ?",
    [jobId, jobId],
  );
  await ds.transaction(async (m) => {
    await m.delete(Job, { id: jobId });
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor.userId,
      action: "job.deleted",
      entityType: "job",
      entityId: jobId,
      detail: { title: job.title },
    });
  });
  if (files && fileIds.length)
    await deleteStoredFiles(
      files,
      await ds.manager.findBy(StoredFile, {
        id: In(fileIds.map((f) => f.fileId)),
      }),
    );
}
