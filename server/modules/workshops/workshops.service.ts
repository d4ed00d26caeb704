import { In, type DataSource, type EntityManager } from "typeorm";
import type { z } from "zod";
import type { Impact } from "../../../shared/programme";
import type { Actor } from "../../policies";
import { authorize } from "../../policies";
import {
  lockingTransaction,
  lockJobRow,
  lockJobTrades,
  lockWorkshopRow,
} from "../../db/locks";
import { HttpError, notFound, zodFields } from "../../http/errors";
import { Job } from "../jobs/jobs.entity";
import { replanJob, replans } from "./replan";
import { audit } from "../audit/audit.service";
import { AuthToken } from "../auth/auth-tokens.entity";
import { User } from "../users/users.entity";
import { Workshop, WorkshopMember } from "./workshops.entity";
import {
  openJobStatuses,
  workshopSettingsSchema,
  type InvitationResponse,
  type MemberResponse,
  type ReplanJob,
  type SettingsPreview,
  type WorkshopResponse,
  type updateWorkshopBodySchema,
} from "../../../shared/schemas";

const ws = (workshopId: string) => ({ kind: "workshop" as const, workshopId });

/** Runs inside the settings change's transaction for each re-planned job: re-confirming moved bookings. */
export type ReplanHook = (
  m: EntityManager,
  job: Job,
  impact: Impact,
  actorUserId: string,
) => Promise<unknown>;

export function presentWorkshop(w: Workshop): WorkshopResponse {
  return {
    id: w.id,
    name: w.name,
    town: w.town,
    timeZone: w.timeZone,
    holidayRegion: w.holidayRegion,
    workingWeekdays: w.workingWeekdays,
    dayStart: w.dayStart,
    dayEnd: w.dayEnd,
    siteWeekdays: w.siteWeekdays,
    arrivalWindows: w.arrivalWindows,
    reminderDays: w.reminderDays,
    setupStep: w.setupStep,
    setupCompletedAt: w.setupCompletedAt?.toISOString() ?? null,
  };
}

async function load(m: EntityManager, workshopId: string): Promise<Workshop> {
  const w = await m.findOneBy(Workshop, { id: workshopId });
  if (!w) throw notFound("That workshop");
  return w;
}

/** The workshop's settings (members). */
export async function getWorkshop(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<WorkshopResponse> {
  authorize(actor, "workshop.read", ws(workshopId));
  return presentWorkshop(await load(ds.manager, workshopId));
}

/**
 * The workshop as it would be: the stored settings with the body laid over them, checked whole
 * with the one settings schema (a day end before a stored day start is refused too), as a 400
 * naming each field.
 */
function proposed(
  current: Workshop,
  body: z.output<typeof updateWorkshopBodySchema>,
): Workshop {
  const { setupStep: _step, setupDone: _done, ...changes } = body;
  const settings: Record<string, unknown> = {};
  for (const key of Object.keys(workshopSettingsSchema.shape))
    settings[key] = current[key as keyof Workshop];
  const result = workshopSettingsSchema
    .refine((b) => b.dayStart < b.dayEnd, {
      message: "The day must end after it starts",
      path: ["dayEnd"],
    })
    .safeParse({ ...settings, ...changes });
  if (!result.success)
    throw new HttpError(
      400,
      "validation",
      "Some fields need attention.",
      zodFields(result.error),
    );
  return { ...current, ...result.data } as Workshop;
}

async function openJobs(m: EntityManager, workshopId: string): Promise<Job[]> {
  return m.find(Job, {
    where: { workshopId, status: In(openJobStatuses) },
    order: { id: "ASC" },
  });
}

/** Most affected first: handover newly at risk, then the finish moving furthest, then bookings. */
function byEffect(a: ReplanJob, b: ReplanJob): number {
  const risk = (j: ReplanJob) =>
    j.handoverAtRisk && !j.handoverAtRiskBefore ? 1 : 0;
  return (
    risk(b) - risk(a) ||
    Math.abs(b.changeDays) - Math.abs(a.changeDays) ||
    b.bookings.length - a.bookings.length ||
    a.title.localeCompare(b.title)
  );
}

/**
 * What a proposed settings change would do to every open job, without saving anything: the same
 * engine run, per job, as the change itself (`replanJob`).
 */
export async function previewSettings(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof updateWorkshopBodySchema>,
): Promise<SettingsPreview> {
  authorize(actor, "workshop.update", ws(workshopId));
  const before = await load(ds.manager, workshopId);
  const after = proposed(before, body);
  if (!replans(before, after))
    return { replans: false, jobs: [], unchangedJobs: 0 };
  const plans = [];
  for (const job of await openJobs(ds.manager, workshopId))
    plans.push(await replanJob(ds.manager, job, before, after));
  return {
    replans: true,
    jobs: plans
      .filter((p) => p.changed)
      .map((p) => p.view)
      .sort(byEffect),
    unchangedJobs: plans.filter((p) => !p.changed).length,
  };
}

/**
 * Changes the workshop's settings (owner). A change the engine reads (nation, time zone, working
 * days or hours) re-plans every open job in the same transaction, under the locking rule
 * (server/db/locks.ts): the workshop's row, each open job's row in id order, then all their
 * trades; each job's version moves (its programme input changed), and each booking the change
 * moves or strands goes to "needs re-confirming" through `replan` (the programme's apply path).
 */
export async function updateWorkshop(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof updateWorkshopBodySchema>,
  replan?: ReplanHook,
): Promise<WorkshopResponse> {
  authorize(actor, "workshop.update", ws(workshopId));
  proposed(await load(ds.manager, workshopId), body);
  await lockingTransaction(ds, async (m) => {
    if (!(await lockWorkshopRow(m, workshopId)))
      throw notFound("That workshop");
    const before = await load(m, workshopId);
    const after = proposed(before, body);
    const plans = [];
    if (replans(before, after)) {
      const jobs = await openJobs(m, workshopId);
      for (const j of jobs) await lockJobRow(m, j.id);
      await lockJobTrades(
        m,
        jobs.map((j) => j.id),
      );
      // Read again after the locks (READ COMMITTED): what the change is applied to is current.
      for (const j of await openJobs(m, workshopId))
        plans.push(await replanJob(m, j, before, after));
    }
    const { setupStep, setupDone } = body;
    await m.update(
      Workshop,
      { id: workshopId },
      {
        name: after.name,
        town: after.town,
        holidayRegion: after.holidayRegion,
        timeZone: after.timeZone,
        workingWeekdays: after.workingWeekdays,
        dayStart: after.dayStart,
        dayEnd: after.dayEnd,
        siteWeekdays: after.siteWeekdays,
        arrivalWindows: after.arrivalWindows,
        reminderDays: after.reminderDays,
        ...(setupStep !== undefined ? { setupStep } : {}),
        ...(setupDone === true
          ? {
              setupStep: null,
              setupCompletedAt: before.setupCompletedAt ?? new Date(),
            }
          : {}),
      },
    );
    for (const p of plans) {
      const version = p.job.version + 1;
      await m.update(
        Job,
        { id: p.job.id },
        {
          holidayRegion: p.next.holidayRegion,
          timeZone: p.next.timeZone,
          version,
        },
      );
      await audit(m, {
        workshopId,
        actorUserId: actor.userId,
        action: "programme.changed",
        entityType: "job",
        entityId: p.job.id,
        detail: {
          jobId: p.job.id,
          toVersion: version,
          summary: "changed the workshop's settings, which re-planned this job",
        },
      });
      if (replan && p.impact.reconfirm.length)
        await replan(m, { ...p.next, version } as Job, p.impact, actor.userId);
    }
    const { setupStep: _s, setupDone: _d, ...changed } = body;
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "workshop.updated",
      entityType: "workshop",
      entityId: workshopId,
      detail: {
        ...changed,
        replannedJobs: plans.filter((p) => p.changed).length,
      },
    });
  });
  return presentWorkshop(await load(ds.manager, workshopId));
}

/** The workshop's owners and fitters (owner). */
export async function listMembers(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<MemberResponse[]> {
  authorize(actor, "members.read", ws(workshopId));
  const members = await ds.getRepository(WorkshopMember).find({
    where: { workshopId },
    relations: { user: true },
    order: { createdAt: "ASC" },
  });
  return members.map((m) => ({
    userId: m.userId,
    name: (m.user as User).name,
    email: (m.user as User).email,
    role: m.role,
    joinedAt: m.createdAt.toISOString(),
  }));
}

/** Invitations sent by the workshop, newest first (owner). */
export async function listInvitations(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<InvitationResponse[]> {
  authorize(actor, "invitations.manage", ws(workshopId));
  const tokens = await ds.getRepository(AuthToken).find({
    where: { workshopId, kind: "invitation" },
    relations: { user: true },
    order: { createdAt: "DESC" },
  });
  return tokens.map((t) => ({
    id: t.id,
    name: (t.user as User).name,
    email: (t.user as User).email,
    role: t.grant.role as InvitationResponse["role"],
    expiresAt: t.expiresAt.toISOString(),
    acceptedAt: t.usedAt?.toISOString() ?? null,
    createdAt: t.createdAt.toISOString(),
    existingAccount: (t.user as User).passwordHash !== null,
  }));
}
