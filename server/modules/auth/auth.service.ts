import type { DataSource, EntityManager } from "typeorm";
import { newId } from "../../db/columns";
import { HttpError } from "../../http/errors";
import { enqueueMail } from "../../infra/outbox/outbox";
import { audit } from "../audit/audit.service";
import { shareDaysOff } from "../feeds/feeds.service";
import { Customer } from "../customers/customers.entity";
import { Trade, TradeMember } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { Workshop, WorkshopMember } from "../workshops/workshops.entity";
import { AuthToken, type TokenGrant } from "./auth-tokens.entity";
import { addDefaultStarters } from "../starters/starters.service";
import { hashPassword, refuseWeakPassword, verifyPassword } from "./passwords";
import { hashToken, newToken } from "./tokens";
import type { z } from "zod";
import type {
  signUpBodySchema,
  TokenInfoResponse,
} from "../../../shared/schemas";

const INVITATION_DAYS = 7;
const RESET_HOURS = 1;
const VERIFY_DAYS = 7;

export interface AuthDeps {
  ds: DataSource;
  appUrl: string;
}

/** Checks an e-mail and password; returns the user id or null (same time either way). */
export async function checkCredentials(
  ds: DataSource,
  email: string,
  password: string,
): Promise<string | null> {
  const user = await ds
    .getRepository(User)
    .findOneBy({ email: email.toLowerCase() });
  const ok = await verifyPassword(user?.passwordHash ?? null, password);
  if (!user || !ok) return null;
  await ds
    .getRepository(User)
    .update({ id: user.id }, { lastSignInAt: new Date() });
  return user.id;
}

async function issueToken(
  m: EntityManager,
  kind: AuthToken["kind"],
  userId: string,
  grant: TokenGrant,
  ttlMs: number,
  invitedByUserId: string | null,
): Promise<{ raw: string; expiresAt: Date; id: string }> {
  const { raw, hash } = newToken();
  const id = newId();
  const expiresAt = new Date(Date.now() + ttlMs);
  await m.insert(AuthToken, {
    id,
    tokenHash: hash,
    kind,
    userId,
    workshopId: "workshopId" in grant ? grant.workshopId : null,
    invitedByUserId,
    grant,
    expiresAt,
    usedAt: null,
    voidedAt: null,
  });
  return { raw, expiresAt, id };
}

const roleWords: Record<string, string> = {
  owner: "an owner",
  fitter: "a fitter",
  trade: "a trade",
  customer: "their customer",
};

/**
 * Creates (or reuses) the invitee's user and e-mails them the link: "choose a password" for a new
 * person, "sign in to accept" for an address that already has an account.
 */
export async function invite(
  deps: AuthDeps,
  by: { userId: string; name: string },
  workshopId: string,
  input: {
    name: string;
    email: string;
    role: "fitter" | "trade" | "customer";
    tradeId?: string;
    customerId?: string;
  },
) {
  return deps.ds.transaction(async (m) => {
    const workshop = await m.findOneByOrFail(Workshop, { id: workshopId });
    let grant: TokenGrant;
    let asWhat: string = roleWords[input.role];
    if (input.role === "trade") {
      const trade = await m.findOneBy(Trade, {
        id: input.tradeId!,
        workshopId,
      });
      if (!trade)
        throw new HttpError(
          422,
          "unprocessable",
          "That trade is not one of this workshop's.",
          { tradeId: ["Choose one of the workshop's trades"] },
        );
      grant = { role: "trade", workshopId, tradeId: trade.id };
      asWhat = trade.businessName;
    } else if (input.role === "customer") {
      const customer = await m.findOneBy(Customer, {
        id: input.customerId!,
        workshopId,
      });
      if (!customer)
        throw new HttpError(
          422,
          "unprocessable",
          "That customer is not one of this workshop's.",
          { customerId: ["Choose one of the workshop's customers"] },
        );
      grant = { role: "customer", workshopId, customerId: customer.id };
    } else {
      grant = { role: "fitter", workshopId };
      const user = await m.findOneBy(User, { email: input.email });
      if (
        user &&
        (await m.findOneBy(WorkshopMember, { workshopId, userId: user.id }))
      ) {
        throw new HttpError(
          409,
          "conflict",
          `${input.email} is already a member of this workshop.`,
          { email: ["Already a member"] },
        );
      }
    }
    let user = await m.findOneBy(User, { email: input.email });
    if (!user) {
      user = m.create(User, {
        id: newId(),
        email: input.email,
        name: input.name,
        passwordHash: null,
        lastSignInAt: null,
        // Proved when they accept (the link reached them).
        emailVerifiedAt: null,
      });
      await m.insert(User, user);
    }
    const token = await issueToken(
      m,
      "invitation",
      user.id,
      grant,
      INVITATION_DAYS * 86400_000,
      by.userId,
    );
    await audit(m, {
      workshopId,
      actorUserId: by.userId,
      action: "invitation.created",
      entityType: "user",
      entityId: user.id,
      detail: { role: input.role, email: input.email },
    });
    // In the same transaction: no invitation without its e-mail, no e-mail for a rolled-back one.
    // Someone who already has an account signs in to accept: the link never sets their password
    // (it would end their sessions elsewhere). Only this workshop's name is in the e-mail.
    const existingAccount = user.passwordHash !== null;
    const link = `${deps.appUrl}/invite/${token.raw}`;
    const asks = `${workshop.name} asks you to join their jobs on Sitecue as ${asWhat}.`;
    const action = existingAccount
      ? "Sign in to accept (your password stays as it is)"
      : "Choose a password to accept";
    await enqueueMail(m, {
      workshopId,
      to: input.email,
      subject: `${workshop.name} invites you to Sitecue`,
      text: [
        `Hello ${input.name},`,
        "",
        asks,
        `${by.name} sent this invitation. Sitecue is where the job's programme, visits and messages are kept.`,
        ...(existingAccount
          ? [
              "You already have a Sitecue account with this address: accepting links it, and your visits for every workshop stay in one list.",
            ]
          : []),
        "",
        `${action}: ${link}`,
        "",
        `The link works once and expires in ${INVITATION_DAYS} days.`,
      ].join("\n"),
      html: `<p>Hello ${escapeHtml(input.name)},</p><p>${escapeHtml(asks)}</p><p>${escapeHtml(by.name)} sent this invitation.</p>${existingAccount ? "<p>You already have a Sitecue account with this address: accepting links it, and your visits for every workshop stay in one list.</p>" : ""}<p><a href="${link}">${escapeHtml(action)}</a></p><p>The link works once and expires in ${INVITATION_DAYS} days.</p>`,
    });
    return {
      id: token.id,
      expiresAt: token.expiresAt,
      userId: user.id,
      existingAccount,
    };
  });
}

/** E-mails a reset link when the address has an account; says nothing either way. */
export async function requestPasswordReset(
  deps: AuthDeps,
  email: string,
): Promise<void> {
  const user = await deps.ds.getRepository(User).findOneBy({ email });
  if (!user) return;
  await deps.ds.transaction(async (m) => {
    const token = await issueToken(
      m,
      "password-reset",
      user.id,
      { role: null },
      RESET_HOURS * 3600_000,
      null,
    );
    const link = `${deps.appUrl}/reset/${token.raw}`;
    await enqueueMail(m, {
      to: user.email,
      subject: "Reset your Sitecue password",
      text: `Hello ${user.name},\n\nSomeone asked to reset the password for this e-mail address on Sitecue.\nChoose a new password: ${link}\n\nThe link works once and expires in ${RESET_HOURS} hour. If it was not you, ignore this e-mail.`,
      html: `<p>Hello ${escapeHtml(user.name)},</p><p>Someone asked to reset the password for this e-mail address on Sitecue.</p><p><a href="${link}">Choose a new password</a></p><p>The link works once and expires in ${RESET_HOURS} hour. If it was not you, ignore this e-mail.</p>`,
    });
  });
}

async function liveToken(
  m: EntityManager,
  raw: string,
  lock = false,
  kinds: readonly AuthToken["kind"][] = ["invitation", "password-reset"],
): Promise<AuthToken> {
  const found = await m.findOne(AuthToken, {
    where: { tokenHash: hashToken(raw) },
    ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}),
  });
  // A link only does what it was made for: an address check never sets a password.
  const token = found && kinds.includes(found.kind) ? found : null;
  if (token?.kind === "verify-email" && token.usedAt)
    throw new HttpError(
      404,
      "token-invalid",
      "This link has already been used: your e-mail address is confirmed. Sign in to carry on.",
    );
  if (token?.kind === "verify-email" && token.expiresAt.getTime() <= Date.now())
    throw new HttpError(
      404,
      "token-invalid",
      "This link has expired. Sign in and choose “Send it again” for a new one.",
    );
  // Each dead link says why, so a person holding an older e-mail knows what to do next.
  if (token?.voidedAt)
    throw new HttpError(
      404,
      "token-invalid",
      "A newer link has been used to set this account's password, so this one no longer works. Sign in with the new password, or ask for a new link.",
    );
  if (token?.usedAt)
    throw new HttpError(
      404,
      "token-invalid",
      "This link has already been used. Sign in, or ask for a new link.",
    );
  if (!token || token.expiresAt.getTime() <= Date.now()) {
    throw new HttpError(
      404,
      "token-invalid",
      "This link has expired or has already been used. Ask for a new one.",
    );
  }
  return token;
}

/**
 * Sets a person's password inside `m`'s transaction and ends what the old one opened: every
 * session (the generation goes up; see DEVELOPERS.md "A new password ends the other sessions")
 * and every outstanding reset link but `keepTokenId` (OWASP ASVS v4.0.3 3.3.3, 2.5.x).
 */
export async function setNewPassword(
  m: EntityManager,
  userId: string,
  passwordHash: string,
  keepTokenId: string | null,
): Promise<void> {
  await m.update(
    User,
    { id: userId },
    { passwordHash, sessionGeneration: () => "sessionGeneration + 1" },
  );
  const others = m
    .createQueryBuilder()
    .update(AuthToken)
    .set({ voidedAt: new Date() })
    .where(
      "userId = :userId AND kind = 'password-reset' AND usedAt IS NULL AND voidedAt IS NULL",
      { userId },
    );
  if (keepTokenId) others.andWhere("id <> :keepTokenId", { keepTokenId });
  await others.execute();
}

/** What the set-password screen shows about a link. */
export async function tokenInfo(
  ds: DataSource,
  raw: string,
): Promise<TokenInfoResponse> {
  const token = await liveToken(ds.manager, raw);
  const user = await ds
    .getRepository(User)
    .findOneByOrFail({ id: token.userId });
  const workshop = token.workshopId
    ? await ds.getRepository(Workshop).findOneBy({ id: token.workshopId })
    : null;
  const g = token.grant;
  const trade =
    g.role === "trade"
      ? await ds.getRepository(Trade).findOneBy({ id: g.tradeId })
      : null;
  return {
    // liveToken's default kinds: an address-check link is never a set-password link.
    kind: token.kind as TokenInfoResponse["kind"],
    email: user.email,
    name: user.name,
    workshopName: workshop?.name ?? null,
    role: g.role,
    tradeName: trade?.businessName ?? null,
    existingAccount: token.kind === "invitation" && user.passwordHash !== null,
  };
}

/** Uses a link once: sets the password and grants what the invitation carried. Returns the user id. */
export async function setPasswordWithToken(
  ds: DataSource,
  raw: string,
  password: string,
): Promise<string> {
  // The link is checked first (an unknown one says so whatever the password), then the password.
  const seen = await liveToken(ds.manager, raw);
  refuseWeakPassword(password, await passwordContext(ds.manager, seen));
  const passwordHash = await hashPassword(password);
  return ds.transaction(async (m) => {
    const token = await liveToken(m, raw, true);
    if (token.kind === "invitation") {
      const user = await m.findOneByOrFail(User, { id: token.userId });
      // Issue 14: an invitation is not a reset. Setting the password would end the person's
      // sessions in every other workshop; they prove the account by signing in instead.
      if (user.passwordHash !== null)
        throw new HttpError(
          409,
          "conflict",
          "This address already has a Sitecue account. Sign in to accept the invitation; your password stays as it is.",
        );
    }
    await setNewPassword(m, token.userId, passwordHash, token.id);
    await useInvitation(m, token);
    return token.userId;
  });
}

/**
 * Accepts an invitation as the signed-in person (an account that already existed): adds the
 * membership, trade or customer link, leaving the password and every session alone.
 */
export async function acceptInvitation(
  ds: DataSource,
  userId: string,
  raw: string,
): Promise<void> {
  await ds.transaction(async (m) => {
    const token = await liveToken(m, raw, true);
    if (token.kind !== "invitation")
      throw new HttpError(
        404,
        "token-invalid",
        "This link is not an invitation.",
      );
    if (token.userId !== userId) {
      const invited = await m.findOneByOrFail(User, { id: token.userId });
      throw new HttpError(
        403,
        "forbidden",
        `This invitation is for ${invited.email}. Sign out, then sign in as ${invited.email} to accept it.`,
      );
    }
    await useInvitation(m, token);
  });
}

/** Marks the link used and grants what it carried (membership, trade link, customer link). */
async function useInvitation(m: EntityManager, token: AuthToken) {
  await m.update(AuthToken, { id: token.id }, { usedAt: new Date() });
  // The link reached them, so the address is theirs (an invitation or a reset proves it).
  await markVerified(m, token.userId);
  const g = token.grant;
  if (g.role === "owner" || g.role === "fitter") {
    const exists = await m.findOneBy(WorkshopMember, {
      workshopId: g.workshopId,
      userId: token.userId,
    });
    if (!exists)
      await m.insert(WorkshopMember, {
        id: newId(),
        workshopId: g.workshopId,
        userId: token.userId,
        role: g.role,
      });
  } else if (g.role === "trade") {
    const exists = await m.findOneBy(TradeMember, {
      tradeId: g.tradeId,
      userId: token.userId,
    });
    if (!exists) {
      await m.insert(TradeMember, {
        id: newId(),
        workshopId: g.workshopId,
        tradeId: g.tradeId,
        userId: token.userId,
      });
      // One person, one set of days off, whichever workshop's record (issue 14).
      await shareDaysOff(m, token.userId);
    }
  } else if (g.role === "customer") {
    await m.update(
      Customer,
      { id: g.customerId, workshopId: g.workshopId },
      { userId: token.userId },
    );
  }
  await audit(m, {
    workshopId: token.workshopId,
    actorUserId: token.userId,
    action:
      token.kind === "invitation" ? "invitation.accepted" : "password.reset",
    entityType: "user",
    entityId: token.userId,
  });
}

/** The words a new password may not be (NIST SP 800-63B §5.1.1.2 "context-specific words"). */
async function passwordContext(
  m: EntityManager,
  token: AuthToken,
): Promise<{ email: string; workshopNames: string[] }> {
  const user = await m.findOneByOrFail(User, { id: token.userId });
  const members = await m.find(WorkshopMember, {
    where: { userId: token.userId },
    relations: { workshop: true },
  });
  const invitedTo = token.workshopId
    ? await m.findOneBy(Workshop, { id: token.workshopId })
    : null;
  return {
    email: user.email,
    workshopNames: [
      ...members.map((x) => x.workshop?.name ?? ""),
      invitedTo?.name ?? "",
    ],
  };
}

/** Marks the person's address verified, once (a later link keeps the first time). */
async function markVerified(m: EntityManager, userId: string): Promise<void> {
  await m
    .createQueryBuilder()
    .update(User)
    .set({ emailVerifiedAt: () => "UTC_TIMESTAMP(3)" })
    .where("id = :userId AND emailVerifiedAt IS NULL", { userId })
    .execute();
}

/** Issues an address-check link for the person and queues its e-mail (to them alone). */
async function queueVerification(
  m: EntityManager,
  deps: AuthDeps,
  user: { id: string; email: string; name: string },
  workshopName: string | null,
): Promise<void> {
  const token = await issueToken(
    m,
    "verify-email",
    user.id,
    { role: null },
    VERIFY_DAYS * 86400_000,
    null,
  );
  const link = `${deps.appUrl}/verify/${token.raw}`;
  const what = workshopName
    ? `You created ${workshopName} on Sitecue with this e-mail address.`
    : "You created a Sitecue account with this e-mail address.";
  await enqueueMail(m, {
    // No workshopId: this is mail about the person's own account, the one message an
    // unverified workshop may cause (see assertWorkshopMaySend).
    to: user.email,
    subject: "Confirm your e-mail address for Sitecue",
    text: [
      `Hello ${user.name},`,
      "",
      what,
      "Until you confirm it, Sitecue sends nothing to your trades, customers or fitters.",
      "",
      `Confirm your address: ${link}`,
      "",
      `The link works once and expires in ${VERIFY_DAYS} days. If it was not you, ignore this e-mail.`,
    ].join("\n"),
    html: `<p>Hello ${escapeHtml(user.name)},</p><p>${escapeHtml(what)}</p><p>Until you confirm it, Sitecue sends nothing to your trades, customers or fitters.</p><p><a href="${link}">Confirm your address</a></p><p>The link works once and expires in ${VERIFY_DAYS} days. If it was not you, ignore this e-mail.</p>`,
  });
}

/** The words for an address that already has an account (a 409 with a field message). */
const alreadyRegistered = () =>
  new HttpError(
    409,
    "conflict",
    "That address already has a Sitecue account — sign in, or reset your password.",
    {
      email: [
        "That address already has a Sitecue account — sign in, or reset your password",
      ],
    },
  );

/**
 * "Create your workshop": in one transaction the person (argon2id), the workshop with its
 * defaults (Europe/London, England & Wales, Mon–Fri 08:00–17:00; the set-up step changes
 * them), their owner membership, the default starters, an audit row and the address-check
 * e-mail. Returns the new user's id; the router signs them in.
 */
export async function signUp(
  deps: AuthDeps,
  body: z.output<typeof signUpBodySchema>,
): Promise<string> {
  refuseWeakPassword(body.password, {
    email: body.email,
    workshopNames: [body.workshopName],
  });
  // Sign-up necessarily says whether an address has an account (OWASP Authentication Cheat
  // Sheet, "Authentication and Error Messages"); the route is rate limited. See DEVELOPERS.md.
  if (await deps.ds.getRepository(User).existsBy({ email: body.email }))
    throw alreadyRegistered();
  const passwordHash = await hashPassword(body.password);
  try {
    return await deps.ds.transaction(async (m) => {
      const userId = newId();
      const workshopId = newId();
      await m.insert(User, {
        id: userId,
        email: body.email,
        name: body.name,
        passwordHash,
        lastSignInAt: new Date(),
        emailVerifiedAt: null,
      });
      await m.insert(Workshop, {
        id: workshopId,
        name: body.workshopName,
        town: "",
        timeZone: "Europe/London",
        holidayRegion: "GB-ENG",
        workingWeekdays: [1, 2, 3, 4, 5],
        dayStart: "08:00",
        dayEnd: "17:00",
      });
      await m.insert(WorkshopMember, {
        id: newId(),
        workshopId,
        userId,
        role: "owner",
      });
      await addDefaultStarters(m, workshopId);
      await audit(m, {
        workshopId,
        actorUserId: userId,
        action: "workshop.created",
        entityType: "workshop",
        entityId: workshopId,
        detail: { by: "sign-up", email: body.email },
      });
      await queueVerification(
        m,
        deps,
        { id: userId, email: body.email, name: body.name },
        body.workshopName,
      );
      return userId;
    });
  } catch (err) {
    // Two sign-ups for one address at once: the unique index decides, the loser hears the same.
    if (
      (err as { driverError?: { errno?: number } }).driverError?.errno === 1062
    )
      throw alreadyRegistered();
    throw err;
  }
}

/** Uses an address-check link once: the person's address counts as verified. Returns it. */
export async function verifyEmail(
  ds: DataSource,
  raw: string,
): Promise<{ email: string; userId: string }> {
  return ds.transaction(async (m) => {
    const token = await liveToken(m, raw, true, ["verify-email"]);
    await m.update(AuthToken, { id: token.id }, { usedAt: new Date() });
    await markVerified(m, token.userId);
    await audit(m, {
      workshopId: null,
      actorUserId: token.userId,
      action: "email.verified",
      entityType: "user",
      entityId: token.userId,
    });
    const user = await m.findOneByOrFail(User, { id: token.userId });
    return { email: user.email, userId: user.id };
  });
}

/** Sends the signed-in person a fresh address-check link (409 when already verified). */
export async function resendVerification(
  deps: AuthDeps,
  userId: string,
): Promise<{ email: string }> {
  return deps.ds.transaction(async (m) => {
    const user = await m.findOneByOrFail(User, { id: userId });
    if (user.emailVerifiedAt)
      throw new HttpError(
        409,
        "conflict",
        "Your e-mail address is already confirmed.",
      );
    const owned = await m.findOne(WorkshopMember, {
      where: { userId, role: "owner" },
      relations: { workshop: true },
      order: { createdAt: "ASC" },
    });
    await queueVerification(m, deps, user, owned?.workshop?.name ?? null);
    return { email: user.email };
  });
}

export function escapeHtml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) =>
      ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[
        c
      ]!,
  );
}
