import { z } from "zod";
import {
  idSchema,
  memberRoleSchema,
  tradeKindSchema,
  workshopNameSchema,
} from "./common";

export const emailSchema = z
  .email({ message: "Enter a valid e-mail address" })
  .max(254)
  .transform((s) => s.toLowerCase());
/**
 * The length rule for every password a person sets (NIST SP 800-63B §5.1.1.2: at least 8
 * characters, at least 64 allowed, no composition rules). The server also refuses breached and
 * context-specific passwords (`checkNewPassword` in server/modules/auth/passwords.ts): the list
 * is too big to ship to the browser.
 */
export const passwordSchema = z
  .string()
  .min(8, "Use at least 8 characters")
  .max(200, "Use at most 200 characters");

/** The hint every new-password field shows, so forms say the rule in one set of words. */
export const passwordHint =
  "At least 8 characters. A few unrelated words make a strong one.";

export const signInBodySchema = z.object({
  email: emailSchema,
  password: z.string().min(1, "Enter your password").max(200),
});
export type SignInBody = z.input<typeof signInBodySchema>;

export const passwordResetBodySchema = z.object({ email: emailSchema });

export const setPasswordBodySchema = z.object({
  token: z.string().min(20).max(200),
  password: passwordSchema,
});

/** "Create your workshop": the workshop, its first owner, and their password. */
export const signUpBodySchema = z.object({
  workshopName: workshopNameSchema,
  name: z.string().trim().min(1, "Enter your name").max(120),
  email: emailSchema,
  password: passwordSchema,
});
export type SignUpBody = z.input<typeof signUpBodySchema>;

export const verifyEmailBodySchema = z.object({
  token: z.string().min(20).max(200),
});

/** The address a verification link confirmed (or resent to). */
export const verifyEmailResponseSchema = z.object({ email: z.string() });
export type VerifyEmailResponse = z.infer<typeof verifyEmailResponseSchema>;

/** Accepting an invitation as the signed-in account it was sent to. */
export const acceptInvitationBodySchema = z.object({
  token: z.string().min(20).max(200),
});

export const tokenParamsSchema = z.object({
  token: z.string().min(20).max(200),
});

/** What the signed-in person is, in each workshop they belong to. */
export const sessionUserSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  /** False from sign-up until the e-mailed link is used: until then Sitecue e-mails nobody else. */
  emailVerified: z.boolean(),
  memberships: z.array(
    z.object({
      workshopId: idSchema,
      workshopName: z.string(),
      role: memberRoleSchema,
    }),
  ),
  trades: z.array(
    z.object({
      tradeId: idSchema,
      workshopId: idSchema,
      workshopName: z.string(),
      businessName: z.string(),
      kind: tradeKindSchema,
    }),
  ),
  customers: z.array(
    z.object({
      customerId: idSchema,
      workshopId: idSchema,
      workshopName: z.string(),
    }),
  ),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const sessionResponseSchema = z.object({
  user: sessionUserSchema.nullable(),
  csrfToken: z.string(),
});
export type SessionResponse = z.infer<typeof sessionResponseSchema>;

export const tokenInfoResponseSchema = z.object({
  kind: z.enum(["invitation", "password-reset"]),
  email: z.string(),
  name: z.string(),
  workshopName: z.string().nullable(),
  role: z.enum(["owner", "fitter", "trade", "customer"]).nullable(),
  /** The trade record an invitation links ("… as Ashby Plaster & Coving"), for a trade. */
  tradeName: z.string().nullable(),
  /** The address already has a Sitecue account: the invitee signs in to accept, no new password. */
  existingAccount: z.boolean(),
});
export type TokenInfoResponse = z.infer<typeof tokenInfoResponseSchema>;
