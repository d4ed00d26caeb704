// The one permission module. Every route asks it; anything not allowed here is denied.
// Rules come from the brief's roles table:
//   owner    – everything in the workshop, incl. members, trades, deleting
//   fitter   – all workshop jobs; edit programmes, book trades…; not members, workshop settings,
//              deleting jobs or trades
//   trade    – only jobs where they have a (sent or later) booking; never other trades' contacts
//   customer – their own job(s)
// Visibility decides 404 versus 403: a record the person cannot see at all is "not found" (its
// existence is not revealed); one they can see but may not change is "forbidden".
import type { MemberRole } from "../../shared/schemas";
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
  /** Trades with a confirmed booking on this job. */
  confirmedTradeIds: ReadonlySet<string>;
}

export interface TradeResource {
  kind: "trade";
  workshopId: string;
  tradeId: string;
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
  | "customers.read"
  | "customers.create"
  | "jobs.list"
  | "jobs.create"
  | "job.read"
  | "job.readFull"
  | "job.readAddress"
  | "job.update"
  | "job.delete";

type Resource = WorkshopResource | JobResource | TradeResource | PersonResource;

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
  }
}

/** Own-data rules: any signed-in person for their own feed; days off only for someone who speaks for a trade. */
function canOwn(actor: Actor, action: Action, person: PersonResource): boolean {
  if (actor.userId !== person.userId) return false;
  switch (action) {
    case "feed.manage":
    case "daysOff.read":
      return true;
    case "daysOff.update":
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
      return false;
    case "workshop.read":
      return isMember(actor, ws);
    case "workshop.update":
    case "members.read":
    case "invitations.manage":
    case "trades.delete":
    case "job.delete":
      return roleIn(actor, ws, "owner");
    case "trades.read":
    case "trades.create":
    case "trades.update":
    case "bookings.manage":
    case "starters.read":
    case "starters.update":
    case "customers.read":
    case "customers.create":
    case "jobs.list":
    case "jobs.create":
    case "job.update":
    case "job.readFull":
      return roleIn(actor, ws, "owner", "fitter");
    case "job.read":
      return resource.kind === "job" && canSee(actor, resource);
    case "job.readAddress":
      if (resource.kind !== "job") return false;
      return (
        isMember(actor, ws) ||
        customerOfJob(actor, resource) ||
        tradeOnJob(actor, resource, resource.confirmedTradeIds)
      );
  }
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
export function requireActor(actor: Actor | null): asserts actor is Actor {
  if (!actor) throw unauthenticated();
}
