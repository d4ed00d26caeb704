import type { Actor } from "../policies";
import type { SessionUser } from "../../shared/schemas";

declare global {
  namespace Express {
    interface User {
      user: SessionUser;
      actor: Actor;
      /** The person's session generation when loaded (users.sessionGeneration). */
      generation: number;
    }
  }
}

declare module "express-session" {
  interface SessionData {
    csrfToken?: string;
  }
}

export {};
