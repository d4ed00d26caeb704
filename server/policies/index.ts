// The one permission module. Every route asks it; anything not allowed here is denied.
// Rules come from the brief's roles table:
//   owner    – everything in the workshop, incl. members, trades, deleting
//   fitter   – all workshop jobs; edit programmes, book trades…; not members, workshop settings,
//              deleting jobs or trades
//   trade    – only jobs where they have a (sent or later) booking; never other trades' contacts
//   customer – their own job(s)
// Visibility decides 404 versus 403: a record the person cannot see at all is "not found" (its
// existence is not revealed); one they can see but may not change is "forbidden".
import { tradeSeesAddress } from "../../shared/bookings/lifecycle";
import type { BookingState } from "../../shared/schemas";
import {
  threadAudiences,
  tradeUploadKinds,
  type DrawingKind,
  type MemberRole,
  type TradeKind,
  type ThreadAudience,
} from "../../shared/schemas";
import { forbidden, notFound, unauthenticated } from "../http/errors";

/** Who is asking, resolved once per request from the signed-in user. */
export interface Actor {
  userId: string;
  /** workshopId → role */
  memberships: Map<string, MemberRole>;
  /** tradeId → workshopId, for each trade record this person speaks for */
  trades: Map<string, string>;
  /** customerId → workshopId */
  customers: Map<string, string>;
}

export interface WorkshopResource {
  kind: "workshop";
  workshopId: string;
}

export interface JobResource {
  kind: "job";
  workshopId: string;
  customerId: string;
  /** Trades with a booking on this job that has been sent (not draft, declined or cancelled). */
  activeTradeIds: ReadonlySet<string>;
  /**
   * Trades who see the job's full address: one of their bookings on it allows it by the booking
   * lifecycle's one address rule (`tradeSeesAddress`: confirmed, or shared by the workshop).
   */
  addressTradeIds: ReadonlySet<string>;
}

export interface TradeResource {
  kind: "trade";
  workshopId: string;
  tradeId: string;
}

/**
 * A drawing, template or site photo on a job, with whom it is shared. The workshop sees every
 * one; a trade only while on the job (an active booking) and when it is shared with their kind or
 * with them by name, or they made it; the customer only when it is shared with the customer.
 */
export interface DrawingResource {
  kind: "drawing";
  workshopId: string;
  job: JobResource;
  /** The kind of each trade with an active booking on the job. */
  tradeKinds: ReadonlyMap<string, TradeKind>;
  sharedTradeKinds: ReadonlySet<TradeKind>;
  sharedTradeIds: ReadonlySet<string>;
  sharedWithCustomer: boolean;
  /** The trade who uploaded it, when a trade did. */
  createdByTradeId: string | null;
}

/**
 * What someone is about to upload to a job, once its fields are read: the kind and, for each
 * task it is for, the trades whose active booking holds that task. The workshop may upload any
 * kind to any task; a trade on the job only a template or site photo, only to their own tasks.
 */
export interface DrawingUploadResource {
  kind: "drawingUpload";
  workshopId: string;
  job: JobResource;
  drawingKind: DrawingKind;
  taskTradeIds: ReadonlyArray<ReadonlySet<string>>;
}

/**
 * One booking as a visit: the trade who holds it sees it once it has been offered (sent or later;
 * a draft is the workshop's alone). The workshop and the job's customer know of the booking; no
 * other trade does, not even one on the same job.
 */
export interface VisitResource {
  kind: "visit";
  workshopId: string;
  tradeId: string;
  offered: boolean;
  job: JobResource;
}

/** A person's own data (their feed, their days off): theirs alone. */
export interface PersonResource {
  kind: "person";
  userId: string;
}

export type Action =
  | "feed.manage"
  | "daysOff.read"
  | "daysOff.update"
  | "workshop.read"
  | "workshop.update"
  | "members.read"
  | "invitations.manage"
  | "trades.read"
  | "trades.create"
  | "trades.update"
  | "trades.delete"
  | "bookings.manage"
  | "starters.read"
  | "starters.update"
  | "starters.delete"
  | "customers.read"
  | "customers.create"
  | "jobs.list"
  // Sending a failed e-mail of the workshop again.
  | "outbox.retry"
  | "jobs.create"
  | "job.read"
  | "job.readFull"
  | "job.readAddress"
  | "job.update"
  | "job.delete"
  // Drawings, templates and site photos (see DrawingResource for who sees which).
  | "drawings.list"
  | "drawings.upload"
  | "drawings.uploadTo"
  | "drawing.read"
  | "drawing.update"
  | "drawing.addRevision"
  | "drawing.delete"
  // A trade's own visits: read, and act on (answer, progress, running late, another day).
  | "visit.read"
  | "visit.act"
  // The job thread: one action per audience, each meaning "see and post there".
  | "thread.audience.job"
  | "thread.audience.trades"
  | "thread.audience.workshop"
  // The customer's timeline of visits and the dates they will be away.
  | "timeline.read"
  | "awayDates.update"
  // Calendars (issue 15): a workshop's or a job's (its owners and fitters), a trade's own.
  | "calendar.read"
  | "calendar.readOwn";

type Resource =
  | WorkshopResource
  | JobResource
  | TradeResource
  | PersonResource
  | DrawingResource
  | DrawingUploadResource
  | VisitResource;

const roleIn = (actor: Actor, workshopId: string, ...roles: MemberRole[]) => {
  const role = actor.memberships.get(workshopId);
  return role !== undefined && roles.includes(role);
};

const isMember = (actor: Actor, workshopId: string) =>
  actor.memberships.has(workshopId);

const tradeOnJob = (actor: Actor, job: JobResource, ids: ReadonlySet<string>) =>
  [...actor.trades.entries()].some(
    ([tradeId, ws]) => ws === job.workshopId && ids.has(tradeId),
  );

const customerOfJob = (actor: Actor, job: JobResource) =>
  actor.customers.get(job.customerId) === job.workshopId;

/** Whether the actor may see the resource at all (decides 404 versus 403). */
export function canSee(actor: Actor, resource: Resource): boolean {
  switch (resource.kind) {
    case "workshop":
      return (
        isMember(actor, resource.workshopId) ||
        [...actor.trades.values()].includes(resource.workshopId) ||
        [...actor.customers.values()].includes(resource.workshopId)
      );
    case "job":
      return (
        isMember(actor, resource.workshopId) ||
        tradeOnJob(actor, resource, resource.activeTradeIds) ||
        customerOfJob(actor, resource)
      );
    case "trade":
      return (
        isMember(actor, resource.workshopId) ||
        actor.trades.has(resource.tradeId)
      );
    case "person":
      return actor.userId === resource.userId;
    case "drawing":
      return canSeeDrawing(actor, resource);
    case "drawingUpload":
      return canSee(actor, resource.job);
    case "visit":
      return (
        isMember(actor, resource.workshopId) ||
        customerOfJob(actor, resource.job) ||
        holdsVisit(actor, resource)
      );
  }
}

/** The person speaks for the trade holding this offered booking. */
const holdsVisit = (actor: Actor, v: VisitResource) =>
  v.offered && actor.trades.get(v.tradeId) === v.workshopId;

const actorTradesIn = (actor: Actor, workshopId: string) =>
  [...actor.trades.entries()]
    .filter(([, ws]) => ws === workshopId)
    .map(([tradeId]) => tradeId);

function canSeeDrawing(actor: Actor, d: DrawingResource): boolean {
  if (isMember(actor, d.workshopId)) return true;
  if (customerOfJob(actor, d.job) && d.sharedWithCustomer) return true;
  return actorTradesIn(actor, d.workshopId).some((tradeId) => {
    if (!d.job.activeTradeIds.has(tradeId)) return false;
    const kind = d.tradeKinds.get(tradeId);
    return (
      d.sharedTradeIds.has(tradeId) ||
      d.createdByTradeId === tradeId ||
      (kind !== undefined && d.sharedTradeKinds.has(kind))
    );
  });
}

/** A trade on the job uploading a kind a trade may upload, to tasks all booked to them. */
function tradeMayUpload(actor: Actor, u: DrawingUploadResource): boolean {
  if (!(tradeUploadKinds as readonly DrawingKind[]).includes(u.drawingKind))
    return false;
  const mine = actorTradesIn(actor, u.workshopId).filter((id) =>
    u.job.activeTradeIds.has(id),
  );
  return (
    u.taskTradeIds.length > 0 &&
    u.taskTradeIds.every((booked) => mine.some((id) => booked.has(id)))
  );
}

/** Own-data rules: any signed-in person for their own feed; days off only for someone who speaks for a trade. */
function canOwn(actor: Actor, action: Action, person: PersonResource): boolean {
  if (actor.userId !== person.userId) return false;
  switch (action) {
    case "feed.manage":
    case "daysOff.read":
      return true;
    // A trade's calendar (calendar.readOwn) is their bookings and days off: nobody else has one.
    case "daysOff.update":
    case "calendar.readOwn":
      return actor.trades.size > 0;
    default:
      return false;
  }
}

/** The rule table: may this actor do this action on this resource? */
export function can(actor: Actor, action: Action, resource: Resource): boolean {
  if (resource.kind === "person") return canOwn(actor, action, resource);
  const ws = resource.workshopId;
  switch (action) {
    case "feed.manage":
    case "daysOff.read":
    case "daysOff.update":
    case "calendar.readOwn":
      return false;
    case "workshop.read":
      return isMember(actor, ws);
    case "workshop.update":
    case "members.read":
    case "invitations.manage":
    case "trades.delete":
    case "job.delete":
    case "starters.delete":
      return roleIn(actor, ws, "owner");
    // calendar.read: the workshop's and a job's calendar show every trade's bookings, so staff
    // only (a trade on the job sees the job, so 403; see `canSee`).
    case "trades.read":
    case "trades.create":
    case "trades.update":
    case "bookings.manage":
    case "starters.read":
    case "starters.update":
    case "customers.read":
    case "customers.create":
    case "jobs.list":
    case "outbox.retry":
    case "jobs.create":
    case "job.update":
    case "job.readFull":
    case "calendar.read":
      return roleIn(actor, ws, "owner", "fitter");
    case "job.read":
      return resource.kind === "job" && canSee(actor, resource);
    case "job.readAddress":
      if (resource.kind !== "job") return false;
      return (
        isMember(actor, ws) ||
        customerOfJob(actor, resource) ||
        tradeOnJob(actor, resource, resource.addressTradeIds)
      );
    // Drawings: anyone who sees the job sees its list (filtered drawing by drawing); the workshop
    // and the trades on the job may upload (what and where: drawings.uploadTo); customers never.
    case "drawings.list":
      return resource.kind === "job" && canSee(actor, resource);
    case "drawings.upload":
      if (resource.kind !== "job") return false;
      return (
        isMember(actor, ws) ||
        tradeOnJob(actor, resource, resource.activeTradeIds)
      );
    case "drawings.uploadTo":
      if (resource.kind !== "drawingUpload") return false;
      return isMember(actor, ws) || tradeMayUpload(actor, resource);
    case "drawing.read":
      return resource.kind === "drawing" && canSeeDrawing(actor, resource);
    case "drawing.update":
      return resource.kind === "drawing" && isMember(actor, ws);
    // The workshop adds revisions to anything; a trade to what they made (still on the job).
    case "drawing.addRevision":
      if (resource.kind !== "drawing") return false;
      return (
        isMember(actor, ws) ||
        (resource.createdByTradeId !== null &&
          actor.trades.get(resource.createdByTradeId) === ws &&
          resource.job.activeTradeIds.has(resource.createdByTradeId))
      );
    case "drawing.delete":
      return resource.kind === "drawing" && roleIn(actor, ws, "owner");
    // A visit is the trade's own: only they read it as a visit and act on it (the workshop has
    // its bookings routes; the customer sees visits on their job's timeline).
    case "visit.read":
    case "visit.act":
      return resource.kind === "visit" && holdsVisit(actor, resource);
    // Thread audiences: "Whole job" is the workshop, the trades on the job and the customer;
    // "Trades & workshop" leaves the customer out; "Workshop only" is owners and fitters.
    case "thread.audience.job":
      if (resource.kind !== "job") return false;
      return (
        isMember(actor, ws) ||
        tradeOnJob(actor, resource, resource.activeTradeIds) ||
        customerOfJob(actor, resource)
      );
    case "thread.audience.trades":
      if (resource.kind !== "job") return false;
      return (
        isMember(actor, ws) ||
        tradeOnJob(actor, resource, resource.activeTradeIds)
      );
    case "thread.audience.workshop":
      return resource.kind === "job" && isMember(actor, ws);
    // The timeline is the customer's own view of their job (the workshop may look at it too);
    // away dates are theirs to give, or the workshop's on their behalf. Trades: neither.
    case "timeline.read":
    case "awayDates.update":
      if (resource.kind !== "job") return false;
      return isMember(actor, ws) || customerOfJob(actor, resource);
  }
}

/** The thread audiences this person sees on the job, and may post to (the same set), widest first. */
export function threadAudiencesFor(
  actor: Actor,
  job: JobResource,
): ThreadAudience[] {
  return threadAudiences.filter((a) => can(actor, `thread.audience.${a}`, job));
}

/** Throws 401 without an actor, 404 when the resource is invisible to them, 403 when the action is not allowed. */
export function authorize(
  actor: Actor | null,
  action: Action,
  resource: Resource,
): asserts actor is Actor {
  if (!actor) throw unauthenticated();
  if (can(actor, action, resource)) return;
  if (!canSee(actor, resource)) throw notFound();
  throw forbidden();
}

/** For routes any signed-in person may use (their own session, their own jobs list). */
/**
 * Whether what is shown or sent about booking `b` carries the job's full address: the lifecycle
 * table's rule for the booking itself (confirmed, or shared by the workshop), or the trade is one
 * who sees the job's address already (another booking of theirs on it allows it), so the visit,
 * the job page, the link page, the e-mails and the feed never disagree (issue 16).
 */
export function bookingShowsAddress(
  b: { tradeId: string; state: BookingState; shareAddress: boolean },
  job: JobResource,
): boolean {
  return tradeSeesAddress(b) || job.addressTradeIds.has(b.tradeId);
}

export function requireActor(actor: Actor | null): asserts actor is Actor {
  if (!actor) throw unauthenticated();
}
