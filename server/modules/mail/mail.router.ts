import { z } from "zod";
import { caughtMailSchema } from "../../../shared/schemas";
import { notFound } from "../../http/errors";
import type { ApiRoutes } from "../../http/routes";
import type { SmtpFake } from "../../infra/mail/smtp-fake";

/**
 * The local mailbox: what the SMTP fake caught. Only registered when the fake runs (development
 * and tests), so in production the route does not exist.
 */
export function registerDevMailRoutes(
  api: ApiRoutes,
  mailbox: SmtpFake | null,
): void {
  api.add({
    method: "get",
    path: "/dev/mail",
    tag: "development",
    summary:
      "Messages caught by the local SMTP fake (development and tests only)",
    response: z.object({ messages: z.array(caughtMailSchema) }),
    handler: async () => {
      if (!mailbox) throw notFound("The local mailbox");
      return { messages: mailbox.messages() };
    },
  });
}
