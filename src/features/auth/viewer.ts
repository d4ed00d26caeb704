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

export function isOwner(
  membership: { role: MemberRole } | null | undefined,
): boolean {
  return membership?.role === "owner";
}
