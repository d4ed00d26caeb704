import type { MemberRole, SessionUser } from "../../../shared/schemas";
import { roleLabels } from "../../lib/labels";

export type Membership = SessionUser["memberships"][number];

/** What the signed-in person is, summed up for navigation and the top bar. */
export interface Viewer {
  user: SessionUser;
  /** Workshops where the person is owner or fitter. */
  memberships: Membership[];
  isMember: boolean;
  /** A short description for the top bar, e.g. "Owner", "Trade · Lime & Lath Plastering". */
  roleDescription: string;
}

export function describeViewer(user: SessionUser): Viewer {
  const memberships = user.memberships;
  let roleDescription: string;
  if (memberships.length > 0) {
    const roles = [...new Set(memberships.map((m) => roleLabels[m.role]))];
    roleDescription = roles.join(" / ");
  } else if (user.trades.length > 0) {
    const names = [...new Set(user.trades.map((t) => t.businessName))];
    roleDescription = `${roleLabels.trade} · ${names.join(", ")}`;
    // A trade who also has work done at home sees both homes; the top bar names both roles.
    if (user.customers.length > 0)
      roleDescription += ` / ${roleLabels.customer}`;
  } else if (user.customers.length > 0) {
    roleDescription = roleLabels.customer;
  } else {
    roleDescription = "No workshop yet";
  }
  return {
    user,
    memberships,
    isMember: memberships.length > 0,
    roleDescription,
  };
}

/**
 * The home page's heading, which is also its label in the top navigation: a member's home is the
 * workshop's jobs; a trade's and a customer's is their visits; anyone else's, their jobs.
 */
export function homeTitle(
  viewer: Viewer,
): "Jobs" | "Your visits" | "Your jobs" {
  if (viewer.isMember) return "Jobs";
  if (viewer.user.trades.length > 0 || viewer.user.customers.length > 0)
    return "Your visits";
  return "Your jobs";
}

export function isOwner(
  membership: { role: MemberRole } | null | undefined,
): boolean {
  return membership?.role === "owner";
}
