import type { DataSource } from "typeorm";
import type { z } from "zod";
import type { Actor } from "../../policies";
import { authorize } from "../../policies";
import { notFound } from "../../http/errors";
import { audit } from "../audit/audit.service";
import { AuthToken } from "../auth/auth-tokens.entity";
import { User } from "../users/users.entity";
import { Workshop, WorkshopMember } from "./workshops.entity";
import type {
  InvitationResponse,
  MemberResponse,
  WorkshopResponse,
  updateWorkshopBodySchema,
} from "../../../shared/schemas";

const ws = (workshopId: string) => ({ kind: "workshop" as const, workshopId });

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
  };
}

async function load(ds: DataSource, workshopId: string): Promise<Workshop> {
  const w = await ds.getRepository(Workshop).findOneBy({ id: workshopId });
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
  return presentWorkshop(await load(ds, workshopId));
}

/** Changes the workshop's settings (owner). */
export async function updateWorkshop(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  body: z.output<typeof updateWorkshopBodySchema>,
): Promise<WorkshopResponse> {
  authorize(actor, "workshop.update", ws(workshopId));
  await load(ds, workshopId);
  await ds.transaction(async (m) => {
    await m.update(Workshop, { id: workshopId }, body);
    await audit(m, {
      workshopId,
      actorUserId: actor.userId,
      action: "workshop.updated",
      entityType: "workshop",
      entityId: workshopId,
      detail: body,
    });
  });
  return presentWorkshop(await load(ds, workshopId));
}

/** The workshop's owners and fitters (owner). */
export async function listMembers(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<MemberResponse[]> {
  authorize(actor, "members.read", ws(workshopId));
  const members = await ds
    .getRepository(WorkshopMember)
    .find({
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
