import type { ReactNode } from "react";
import { NavLink, useNavigate } from "react-router-dom";
import { useSignOut } from "../../features/auth/api/sign-out";
import { homeTitle, type Viewer } from "../../features/auth/viewer";
import { VerifyEmailBanner } from "../../features/auth/components/VerifyEmailBanner";
import { Button, cx } from "../../components/ui";
import { errorMessage } from "../../lib/api-client";
import { useActiveWorkshop } from "../active-workshop";
import { SkipLink } from "./SkipLink";
import { Wordmark } from "./Wordmark";

interface NavItem {
  to: string;
  label: string;
}

function navItems(viewer: Viewer, isOwnerOfActive: boolean): NavItem[] {
  // The first item reads as the home page's heading does.
  const home = { to: "/", label: homeTitle(viewer) };
  if (!viewer.isMember)
    return viewer.user.trades.length > 0
      ? [home, { to: "/my-calendar", label: "My calendar" }]
      : [home];
  const items: NavItem[] = [
    home,
    { to: "/calendar", label: "Calendar" },
    { to: "/trades", label: "Trades" },
    { to: "/customers", label: "Customers" },
  ];
  if (isOwnerOfActive)
    items.push(
      { to: "/members", label: "Members" },
      { to: "/settings", label: "Settings" },
    );
  return items;
}

function WorkshopPicker() {
  const { active, memberships, choose } = useActiveWorkshop();
  if (!active) return null;
  if (memberships.length === 1) {
    // On a phone the page header already names the workshop.
    return (
      <span className="truncate text-sm text-ink-soft max-sm:hidden">
        {active.workshopName}
      </span>
    );
  }
  return (
    <label className="flex items-center gap-2 text-sm text-ink-soft">
      <span className="sr-only sm:not-sr-only">Workshop</span>
      <select
        className="rounded border border-rule-strong bg-card px-2 py-1 text-sm text-ink"
        value={active.workshopId}
        onChange={(e) => choose(e.target.value)}
      >
        {memberships.map((m) => (
          <option key={m.workshopId} value={m.workshopId}>
            {m.workshopName}
          </option>
        ))}
      </select>
    </label>
  );
}

/** The signed-in frame: top bar with wordmark, the role's navigation, who is signed in. */
export function AppLayout({
  viewer,
  children,
}: {
  viewer: Viewer;
  children: ReactNode;
}) {
  const { active } = useActiveWorkshop();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const items = navItems(viewer, active?.role === "owner");

  const onSignOut = () =>
    signOut.mutate(undefined, {
      onSuccess: () => navigate("/sign-in", { replace: true }),
    });

  return (
    <div className="flex min-h-screen flex-col">
      <SkipLink />
      <header className="border-b border-rule bg-card">
        <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2.5">
          <Wordmark />
          <nav
            aria-label="Main"
            className="order-3 w-full sm:order-none sm:w-auto"
          >
            {/* Up to six links for an owner: narrower on a phone, and wrapping rather than overflowing at 375 px. */}
            <ul className="flex flex-wrap gap-1">
              {items.map((item) => (
                <li key={item.to}>
                  <NavLink
                    to={item.to}
                    end={item.to === "/"}
                    className={({ isActive }) =>
                      cx(
                        "block rounded px-2 py-1.5 text-sm font-medium sm:px-3",
                        isActive
                          ? "bg-accent-wash text-accent-strong"
                          : "text-ink hover:bg-paper",
                      )
                    }
                  >
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          <div className="ml-auto flex min-w-0 items-center gap-3">
            <WorkshopPicker />
            <div className="min-w-0 text-right leading-tight">
              <p className="truncate text-sm font-medium">{viewer.user.name}</p>
              <p className="truncate text-xs text-ink-soft">
                {viewer.roleDescription}
              </p>
            </div>
            <Button
              variant="secondary"
              size="sm"
              onClick={onSignOut}
              busy={signOut.isPending}
            >
              Sign out
            </Button>
          </div>
        </div>
        {signOut.isError ? (
          <p
            role="alert"
            className="mx-auto max-w-page px-4 pb-2 text-sm text-risk"
          >
            Could not sign out: {errorMessage(signOut.error)}
          </p>
        ) : null}
      </header>
      <VerifyEmailBanner user={viewer.user} />
      <main
        id="main"
        tabIndex={-1}
        className="mx-auto w-full max-w-page flex-1 px-4 py-6 sm:py-8"
      >
        {children}
      </main>
    </div>
  );
}
