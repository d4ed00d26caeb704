import {
  createBrowserRouter,
  Outlet,
  ScrollRestoration,
} from "react-router-dom";
import { PublicOutlet, RequireAuth } from "./layout/guards";
import { RouteErrorPage } from "./routes/route-error";
import { SignInRoute } from "./routes/sign-in";
import { SignUpRoute } from "./routes/sign-up";
import { VerifyEmailRoute } from "./routes/verify-email";
import { ForgotPasswordRoute } from "./routes/forgot-password";
import { InviteRoute, ResetRoute } from "./routes/set-password";
import { DevMailRoute } from "./routes/dev-mail";
import { BookingLinkRoute } from "./routes/booking-link";
import { HomeRoute } from "./routes/home";
import { JobRoute } from "./routes/job";
import { ProgrammeRoute } from "./routes/programme";
import { DrawingRoute } from "./routes/drawing";
import { VisitRoute } from "./routes/visit";
import { TradesRoute } from "./routes/trades";
import { CustomersRoute } from "./routes/customers";
import { MembersRoute } from "./routes/members";
import { SettingsRoute } from "./routes/settings";
import { SetupRoute } from "./routes/setup";
import { NotFoundRoute } from "./routes/not-found";

function Root() {
  return (
    <>
      <Outlet />
      <ScrollRestoration />
    </>
  );
}

export function createAppRouter() {
  return createBrowserRouter([
    {
      element: <Root />,
      errorElement: <RouteErrorPage />,
      children: [
        {
          element: <PublicOutlet />,
          children: [
            { path: "sign-in", element: <SignInRoute /> },
            { path: "forgot-password", element: <ForgotPasswordRoute /> },
            { path: "invite/:token", element: <InviteRoute /> },
            { path: "reset/:token", element: <ResetRoute /> },
            { path: "dev/mail/:messageId?", element: <DevMailRoute /> },
            // A booking's confirmation link works without an account (brief, "Who uses it").
            { path: "b/:token", element: <BookingLinkRoute /> },
            { path: "sign-up", element: <SignUpRoute /> },
            { path: "verify/:token", element: <VerifyEmailRoute /> },
          ],
        },
        {
          element: <RequireAuth />,
          children: [
            { index: true, element: <HomeRoute /> },
            { path: "jobs/:jobId", element: <JobRoute /> },
            { path: "jobs/:jobId/programme", element: <ProgrammeRoute /> },
            {
              path: "jobs/:jobId/drawings/:drawingId",
              element: <DrawingRoute />,
            },
            { path: "visits/:bookingId", element: <VisitRoute /> },
            { path: "trades", element: <TradesRoute /> },
            { path: "customers", element: <CustomersRoute /> },
            { path: "members", element: <MembersRoute /> },
            { path: "settings", element: <SettingsRoute /> },
            { path: "setup", element: <SetupRoute /> },
            // FullCalendar (~80 KB gzip) loads with these routes only.
            { path: "calendar", lazy: () => import("./routes/calendar") },
            { path: "my-calendar", lazy: () => import("./routes/my-calendar") },
          ],
        },
        { path: "*", element: <NotFoundRoute /> },
      ],
    },
  ]);
}
