import type { Actor } from "../policies";
import type { SessionUser } from "../../shared/schemas";

declare global {
  namespace Express {
    interface User {
      user: SessionUser;
      actor: Actor;
    }
  }
}

declare module "express-session" {
  interface SessionData {
    csrfToken?: string;
  }
}

export {};
