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
import { hashPassword, verifyPassword } from "./passwords";
import { hashToken, newToken } from "./tokens";
import type { TokenInfoResponse } from "../../../shared/schemas";

const INVITATION_DAYS = 7;
const RESET_HOURS = 1;

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
): Promise<AuthToken> {
  const token = await m.findOne(AuthToken, {
    where: { tokenHash: hashToken(raw) },
    ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}),
  });
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
    kind: token.kind,
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

export function escapeHtml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) =>
      ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[
        c
      ]!,
  );
}
