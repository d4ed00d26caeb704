import crypto from "node:crypto";
import express, { type Express } from "express";
import session from "express-session";
import compression from "compression";
import helmet from "helmet";
import { Passport } from "passport";
import { Strategy as LocalStrategy } from "passport-local";
import type { DataSource } from "typeorm";
import type { DbSettings } from "./db/data-source";
import cookieParser from "cookie-parser";
import { DatabaseWatch } from "./db/database-watch";
import { csrfProtection } from "./http/csrf";
import { createLimitStore } from "./http/rate-limit";
import { SESSION_MAX_AGE_MS, createSessionStore } from "./http/session-store";
import { queryTally } from "./db/query-tally";
import { errorHandler, notFoundRoute } from "./http/errors";
import { openApiDocument } from "./http/openapi";
import { ApiRoutes } from "./http/routes";
import type { Mailer } from "./infra/mail/mailer";
import type { SmtpFake } from "./infra/mail/smtp-fake";
import type { Storage } from "./infra/storage/storage";
import type { FilesDeps } from "./modules/files/files.service";
import { registerAuthRoutes } from "./modules/auth/auth.router";
import { checkCredentials } from "./modules/auth/auth.service";
import { registerCustomerRoutes } from "./modules/customers/customers.router";
import { registerFeedRoutes } from "./modules/feeds/feeds.router";
import { registerHealthRoutes } from "./modules/health/health.router";
import { registerJobRoutes } from "./modules/jobs/jobs.router";
import { registerProgrammeRoutes } from "./modules/programme/programme.router";
import type { AfterApply } from "./modules/programme/programme.service";
import { registerStarterRoutes } from "./modules/starters/starters.router";
import { registerBookingRoutes } from "./modules/bookings/bookings.router";
import { reconfirmAfterChange } from "./modules/bookings/bookings.service";
import { receiveCalendarReply } from "./modules/bookings/calendar-reply";
import { sendDueReminders } from "./modules/bookings/reminders";
import type { InboundMail } from "./infra/mail/inbound";
import { registerDevMailRoutes } from "./modules/mail/mail.router";
import { registerDrawingRoutes } from "./modules/drawings/drawings.router";
import { registerTradeRoutes } from "./modules/trades/trades.router";
import { registerVisitRoutes } from "./modules/visits/visits.router";
import { registerThreadRoutes } from "./modules/thread/thread.router";
import { registerTimelineRoutes } from "./modules/timeline/timeline.router";
import { registerAttentionRoutes } from "./modules/attention/attention.router";
import { registerCalendarRoutes } from "./modules/calendar/calendar.router";
import { registerOutboxRoutes } from "./modules/outbox/outbox.router";
import {
  DEFAULT_NOTICE_DELAY_MS,
  sendThreadNotices,
} from "./modules/thread/thread.service";
import { loadSessionUser } from "./modules/users/users.service";
import { registerWorkshopRoutes } from "./modules/workshops/workshops.router";

export interface AppDeps {
  ds: DataSource;
  db: DbSettings;
  mailer: Mailer;
  /** The local SMTP fake, when one runs (development and tests): enables /api/dev/mail. */
  mailbox: SmtpFake | null;
  /** The bucket for uploaded files (S3; s3rver in development and tests). */
  storage: Storage;
  /** The largest upload accepted, in bytes (25 MB unless set). */
  uploadMaxBytes?: number;
  appUrl: string;
  sessionSecret: string;
  production: boolean;
  /** The dev client (Vite) needs inline scripts and a websocket; production does not. */
  devClient?: boolean;
  /** Failed sign-ins per account (e-mail address), counted across client addresses, per window. */
  signInLimit?: number;
  /** Failed sign-ins per client address, any account, per window (default 10 × signInLimit). */
  signInAddressLimit?: number;
  /** Requests per 15 minutes per address to the public booking-link routes. */
  linkLimit?: number;
  /** Domain of per-booking reply addresses (iTIP REPLYs come back to booking-<id>@this). */
  replyDomain?: string;
  signInWindowMs?: number;
  /** How long thread messages gather before one notice e-mail per person (default 5 minutes). */
  threadNoticeDelayMs?: number;
  trustProxy?: boolean;
  version?: string;
  /** Whether the database answers; made here when not given (main.ts shares one with its pollers). */
  database?: DatabaseWatch;
}

/** What a session stores about its signed-in person (passport's `req.session.passport.user`). */
interface SessionRef {
  id: string;
  generation: number;
}

export interface SitecueApp {
  app: Express;
  routes: ApiRoutes;
  /** Handles a message the inbound SMTP receiver got (iTIP REPLYs to booking addresses). */
  receiveMail(mail: InboundMail): Promise<void>;
  /** Sends the day-before reminders that are due. */
  sendReminders(now?: Date): Promise<number>;
  /** Sends the thread notice e-mails that are due (one per person per job, batched). */
  sendThreadNotices(now?: Date): Promise<number>;
  /** Whether the database answers; an outage is logged once, not per request. */
  database: DatabaseWatch;
  close(): Promise<void>;
}

/** `Cache-Control: no-store` unless a later handler sets its own. */
const noStore: express.RequestHandler = (_req, res, next) => {
  res.setHeader("Cache-Control", "no-store");
  next();
};

/** The Express app without listening (tests use it with supertest). Client serving is added by the caller. */
export function createApp(deps: AppDeps): SitecueApp {
  const app = express();
  const version = deps.version ?? "0.1.0";
  app.disable("x-powered-by");
  if (deps.trustProxy) app.set("trust proxy", 1);

  // A fresh nonce per response: FullCalendar injects its CSS at run time and reads the nonce
  // from <meta name="csp-nonce"> (server/http/client.ts writes it into index.html).
  app.use((_req, res, next) => {
    res.locals.cspNonce = crypto.randomBytes(16).toString("base64");
    next();
  });
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          "default-src": ["'self'"],
          // Production serves only bundled files. Vite's dev client injects an inline preamble
          // and talks over a websocket, so development relaxes exactly those two.
          "script-src": deps.devClient
            ? ["'self'", "'unsafe-inline'"]
            : ["'self'"],
          // A nonce would switch 'unsafe-inline' off, so development keeps only the latter.
          "style-src": deps.devClient
            ? ["'self'", "'unsafe-inline'"]
            : [
                "'self'",
                (_req, res) =>
                  `'nonce-${(res as express.Response).locals.cspNonce}'`,
              ],
          "connect-src": deps.devClient ? ["'self'", "ws:"] : ["'self'"],
          "img-src": ["'self'", "data:", "blob:"],
          "font-src": ["'self'", "data:"],
          "object-src": ["'none'"],
          "base-uri": ["'self'"],
          "form-action": ["'self'"],
          "frame-ancestors": ["'none'"],
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );

  // The sessions table; its expiry moves at most once a minute per session (session-store.ts).
  const store = createSessionStore(deps.db);

  // One Passport per app (not the module singleton), so two apps in one process never share strategies.
  const passport = new Passport();
  passport.use(
    new LocalStrategy(
      { usernameField: "email", passwordField: "password" },
      (email, password, done) => {
        checkCredentials(deps.ds, email, password)
          .then(async (userId) =>
            userId
              ? done(
                  null,
                  (await loadSessionUser(deps.ds.manager, userId)) ?? false,
                )
              : done(null, false),
          )
          .catch(done);
      },
    ),
  );
  // The session keeps the person's id and session generation; a new password raises the
  // generation, so every session signed in before it is no longer signed in (ASVS v4.0.3 3.3.3).
  passport.serializeUser((u, done) => {
    const { user, generation } = u as Express.User;
    done(null, { id: user.id, generation } satisfies SessionRef);
  });
  passport.deserializeUser((ref: SessionRef | string, done) => {
    // A session from before generations (a bare id) is signed out once rather than trusted.
    if (typeof ref !== "object" || typeof ref?.id !== "string")
      return done(null, false);
    loadSessionUser(deps.ds.manager, ref.id)
      .then((loaded) =>
        done(
          null,
          loaded && loaded.generation === ref.generation ? loaded : false,
        ),
      )
      .catch(done);
  });

  const api = new ApiRoutes();
  const authDeps = { ds: deps.ds, mailer: deps.mailer, appUrl: deps.appUrl };
  const database = deps.database ?? new DatabaseWatch({ ds: deps.ds });
  registerHealthRoutes(api, deps.ds, database, version);
  // Rate-limit counters live in MariaDB, so every app process counts against the same numbers.
  const limits = createLimitStore(deps.db);
  const signInLimit = deps.signInLimit ?? 10;
  registerAuthRoutes(api, authDeps, passport, {
    signInLimit,
    signInAddressLimit: deps.signInAddressLimit ?? signInLimit * 10,
    windowMs: deps.signInWindowMs ?? 15 * 60 * 1000,
    limits,
  });
  // Uploads (drawings, templates, site photos, thread attachments) go through server/modules/files.
  const files: FilesDeps = {
    ds: deps.ds,
    storage: deps.storage,
    maxBytes: deps.uploadMaxBytes ?? 25 * 1024 * 1024,
  };
  registerJobRoutes(api, deps.ds, files);
  const bookingDeps = {
    ds: deps.ds,
    appUrl: deps.appUrl,
    linkSecret: deps.sessionSecret,
    replyDomain: deps.replyDomain ?? "replies.sitecue.example.test",
  };
  // Applying a programme change re-books the trades it moves (scenario 4), in the same transaction.
  const reconfirm: AfterApply = async (m, job, impact, actorUserId) => {
    await reconfirmAfterChange(m, bookingDeps, job, impact, actorUserId);
  };
  registerProgrammeRoutes(api, deps.ds, reconfirm);
  registerBookingRoutes(api, bookingDeps, {
    linkLimit: deps.linkLimit ?? 120,
    limits,
  });
  registerStarterRoutes(api, deps.ds);
  // A settings change that re-plans open jobs re-books the trades it moves, as above (issue 14).
  registerWorkshopRoutes(api, authDeps, reconfirm);
  registerTradeRoutes(api, deps.ds);
  registerCustomerRoutes(api, deps.ds);
  registerFeedRoutes(api, bookingDeps);
  registerVisitRoutes(api, bookingDeps);
  registerDrawingRoutes(api, { ds: deps.ds, files, appUrl: deps.appUrl });
  const threadDeps = {
    ds: deps.ds,
    appUrl: deps.appUrl,
    files,
    noticeDelayMs: deps.threadNoticeDelayMs ?? DEFAULT_NOTICE_DELAY_MS,
  };
  registerThreadRoutes(api, threadDeps);
  registerTimelineRoutes(api, deps.ds);
  registerAttentionRoutes(api, deps.ds);
  registerCalendarRoutes(api, deps.ds);
  registerOutboxRoutes(api, deps.ds);
  if (deps.mailbox) registerDevMailRoutes(api, deps.mailbox);
  api.add({
    method: "get",
    path: "/openapi.json",
    tag: "meta",
    summary: "This API as OpenAPI 3.1",
    handler: async () => openApiDocument(api.specs, version),
  });

  // gzip for the built client and the API's JSON (and the feeds' iCalendar text): the phone's
  // first load is mostly JavaScript, which compresses to about a quarter (issue 15).
  app.use(compression());
  app.use(
    "/api",
    // Counts each request's SQL statements into its Server-Timing header; before the session, so
    // the session store's reads and writes count too.
    queryTally,
    // API answers are per person and change all the time: never stored by a browser or proxy
    // (RFC 9111 §5.2.2.5). Routes that allow caching set their own (downloads, feeds).
    noStore,
    express.json({ limit: "1mb" }),
    // Signed cookies: an anonymous visitor's CSRF token (server/http/csrf.ts), so no session row.
    cookieParser(deps.sessionSecret),
    session({
      name: "sitecue.sid",
      secret: deps.sessionSecret,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: {
        httpOnly: true,
        sameSite: "lax",
        secure: deps.production,
        maxAge: SESSION_MAX_AGE_MS,
      },
    }),
    passport.initialize(),
    passport.session(),
    csrfProtection,
    api.router,
    notFoundRoute,
    errorHandler((err) => console.error("[sitecue] unexpected error:", err), {
      database,
    }),
  );

  return {
    app,
    routes: api,
    receiveMail: (mail) => receiveCalendarReply(bookingDeps, deps.ds, mail),
    sendReminders: (now) => sendDueReminders(bookingDeps, now),
    sendThreadNotices: (now) => sendThreadNotices(threadDeps, now),
    database,
    close: async () => {
      database.close();
      await store.close();
      await limits.close();
    },
  };
}
