import { In, type EntityManager } from "typeorm";
import { drawingKindLabels } from "../../../shared/schemas";
import { enqueueMail } from "../../infra/outbox/outbox";
import { escapeHtml } from "../auth/auth.service";
import { Booking } from "../bookings/bookings.entity";
import { Customer } from "../customers/customers.entity";
import { ACTIVE_STATES } from "../jobs/job-access";
import type { Job } from "../jobs/jobs.entity";
import { Trade } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { WorkshopMember, type Workshop } from "../workshops/workshops.entity";
import type { Drawing, DrawingRevision } from "./drawings.entity";

export interface RevisionNotice {
  appUrl: string;
  workshop: Workshop;
  job: Job;
  drawing: Drawing;
  revision: DrawingRevision;
  uploader: User;
  /** The trade the uploader spoke for, when a trade uploaded it. */
  uploaderTrade: Trade | null;
}

/** Where the drawing opens in the app (the client's drawing page). */
export const drawingUrl = (appUrl: string, d: Drawing) =>
  `${appUrl}/jobs/${d.jobId}/drawings/${d.id}`;

/**
 * The people outside the workshop a drawing is shared with, by address: the trades on the job it
 * is shared with (by kind, by name, or who made it) and the customer when it is shared with them.
 * There are no per-person notice preferences in Sitecue yet, so everyone it is shared with hears.
 */
export async function sharedAudience(
  m: EntityManager,
  d: Pick<
    Drawing,
    | "jobId"
    | "shareTradeIds"
    | "shareTradeKinds"
    | "shareWithCustomer"
    | "createdByTradeId"
  >,
  customerId: string,
): Promise<Map<string, string>> {
  const to = new Map<string, string>(); // address → greeting name
  const onJob = await m.find(Booking, {
    where: { jobId: d.jobId, state: In(ACTIVE_STATES) },
    select: { tradeId: true },
  });
  const tradeIds = [...new Set(onJob.map((b) => b.tradeId))];
  const trades = tradeIds.length
    ? await m.findBy(Trade, { id: In(tradeIds) })
    : [];
  for (const t of trades) {
    const shared =
      d.shareTradeIds.includes(t.id) ||
      d.shareTradeKinds.includes(t.kind) ||
      d.createdByTradeId === t.id;
    if (shared) to.set(t.email.toLowerCase(), t.contactName);
  }
  if (d.shareWithCustomer) {
    const customer = await m.findOneBy(Customer, { id: customerId });
    if (customer) to.set(customer.email.toLowerCase(), customer.name);
  }
  return to;
}

/**
 * Who hears of a new revision (Rev A included): everyone it is shared with, never the uploader
 * (nor the trade they speak for). When a trade uploads, the workshop (owner and fitters) is told
 * as well: it was made for them.
 */
export async function queueRevisionNotices(
  m: EntityManager,
  n: RevisionNotice,
): Promise<string[]> {
  const { drawing: d } = n;
  const to = await sharedAudience(m, d, n.job.customerId);
  if (n.uploaderTrade) to.delete(n.uploaderTrade.email.toLowerCase());
  if (n.uploaderTrade) {
    const members = await m.find(WorkshopMember, {
      where: { workshopId: d.workshopId },
      relations: { user: true },
    });
    for (const member of members)
      if (member.user)
        to.set(member.user.email.toLowerCase(), member.user.name);
  }
  to.delete(n.uploader.email.toLowerCase());

  const kind = drawingKindLabels[d.kind].toLowerCase();
  const rev = `Rev ${n.revision.letter}`;
  const by = n.uploaderTrade
    ? `${n.uploader.name} (${n.uploaderTrade.businessName})`
    : `${n.uploader.name} of ${n.workshop.name}`;
  const subject = n.uploaderTrade
    ? `${n.uploaderTrade.businessName} uploaded a ${kind}: ${d.title} ${rev} — ${n.job.title}`
    : n.revision.letter === "A"
      ? `${n.workshop.name}: new ${kind} for ${n.job.title} — ${d.title} ${rev}`
      : `${n.workshop.name}: ${d.title} is now ${rev} — ${n.job.title}`;
  const url = drawingUrl(n.appUrl, d);
  for (const [address, name] of to) {
    const lines = [
      `Hello ${name},`,
      "",
      n.revision.letter === "A"
        ? `${by} uploaded the ${kind} “${d.title}” (${rev}) for ${n.job.title}, ${n.job.area}.`
        : `${by} uploaded ${rev} of “${d.title}” for ${n.job.title}, ${n.job.area}. Earlier revisions are kept.`,
      n.revision.note ? `Note: ${n.revision.note}` : "",
      "",
      `Open it: ${url}`,
    ].filter((l, i, a) => !(l === "" && a[i - 1] === ""));
    await enqueueMail(m, {
      workshopId: d.workshopId,
      to: address,
      subject,
      text: lines.join("\n"),
      html: lines
        .map((l) =>
          l.startsWith("Open it: ")
            ? `<p><a href="${escapeHtml(url)}">Open ${escapeHtml(d.title)} ${rev}</a></p>`
            : l
              ? `<p>${escapeHtml(l)}</p>`
              : "",
        )
        .join(""),
    });
  }
  return [...to.keys()];
}

/**
 * Tells the people a drawing has just been shared with (a change of sharing, not a new revision)
 * that they can now see it, at its current revision.
 */
export async function queueSharedNotices(
  m: EntityManager,
  n: {
    appUrl: string;
    workshop: Workshop;
    job: Job;
    drawing: Drawing;
    to: Map<string, string>;
  },
): Promise<void> {
  const { drawing: d } = n;
  const kind = drawingKindLabels[d.kind].toLowerCase();
  const rev = `Rev ${d.currentRevision}`;
  const url = drawingUrl(n.appUrl, d);
  for (const [address, name] of n.to) {
    const lines = [
      `Hello ${name},`,
      "",
      `${n.workshop.name} has shared the ${kind} “${d.title}” (${rev}) for ${n.job.title}, ${n.job.area} with you.`,
      "",
      `Open it: ${url}`,
    ];
    await enqueueMail(m, {
      workshopId: d.workshopId,
      to: address,
      subject: `${n.workshop.name}: ${d.title} ${rev} shared with you — ${n.job.title}`,
      text: lines.join("\n"),
      html: lines
        .map((l) =>
          l.startsWith("Open it: ")
            ? `<p><a href="${escapeHtml(url)}">Open ${escapeHtml(d.title)} ${rev}</a></p>`
            : l
              ? `<p>${escapeHtml(l)}</p>`
              : "",
        )
        .join(""),
    });
  }
}
