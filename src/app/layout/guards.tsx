import { useMemo } from "react";
import {
  Navigate,
  Outlet,
  useLocation,
  useOutletContext,
} from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { describeViewer, type Viewer } from "../../features/auth/viewer";
import { ErrorState, LoadingState } from "../../components/ui";
import { ActiveWorkshopProvider } from "../active-workshop";
import { AppLayout } from "./AppLayout";
import { PublicLayout } from "./PublicLayout";

/** Where a signed-out visitor was going, so sign-in can take them back there. */
export interface FromState {
  from?: string;
}

function FullPage({ children }: { children: React.ReactNode }) {
  return (
    <main
      id="main"
      className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-4"
    >
      {children}
    </main>
  );
}

/** Pages for signed-in people: loads the session, else sends them to sign in. */
export function RequireAuth() {
  const session = useSession();
  const location = useLocation();
  const user = session.data?.user ?? null;
  const viewer = useMemo<Viewer | null>(
    () => (user ? describeViewer(user) : null),
    [user],
  );

  if (session.isPending) {
    return (
      <FullPage>
        <LoadingState label="Opening Sitecue…" />
      </FullPage>
    );
  }
  if (session.isError) {
    return (
      <FullPage>
        <h1 className="sr-only">Sitecue</h1>
        <ErrorState
          error={session.error}
          title="Sitecue can't reach the server"
          onRetry={() => session.refetch()}
        />
      </FullPage>
    );
  }
  if (!viewer) {
    const from = `${location.pathname}${location.search}${location.hash}`;
    return (
      <Navigate to="/sign-in" replace state={{ from } satisfies FromState} />
    );
  }
  return (
    <ActiveWorkshopProvider memberships={viewer.memberships}>
      <AppLayout viewer={viewer}>
        <Outlet context={viewer} />
      </AppLayout>
    </ActiveWorkshopProvider>
  );
}

/** Pages used before signing in. */
export function PublicOutlet() {
  return (
    <PublicLayout wide={useLocation().pathname.startsWith("/dev/")}>
      <Outlet />
    </PublicLayout>
  );
}

/** The signed-in person, for route components under RequireAuth. */
export function useViewer(): Viewer {
  return useOutletContext<Viewer>();
}
