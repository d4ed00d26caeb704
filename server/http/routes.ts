import {
  Router,
  type Request,
  type RequestHandler,
  type Response,
} from "express";
import type { z } from "zod";
import type { Actor } from "../policies";
import { parse } from "./validate";

type Method = "get" | "post" | "patch" | "put" | "delete";

export interface RouteContext<P, Q, B> {
  req: Request;
  res: Response;
  /** The signed-in person, or null; the handler must ask the policy module before acting. */
  actor: Actor | null;
  params: P;
  query: Q;
  body: B;
}

export interface RouteSpec<
  P extends z.ZodType = z.ZodType,
  Q extends z.ZodType = z.ZodType,
  B extends z.ZodType = z.ZodType,
> {
  method: Method;
  /** Express path below /api, e.g. "/jobs/:jobId". */
  path: string;
  summary: string;
  tag: string;
  params?: P;
  query?: Q;
  body?: B;
  response?: z.ZodType;
  /**
   * An upload's text fields, for the OpenAPI document only: the handler authorises first and then
   * reads the multipart body with `receiveUploads` (server/modules/files), which parses these.
   */
  multipart?: z.ZodObject;
  /** Runs before validation (e.g. a rate limiter). */
  before?: RequestHandler[];
  /** Success status; 204 sends no body. */
  status?: number;
  handler: (
    ctx: RouteContext<z.output<P>, z.output<Q>, z.output<B>>,
  ) => Promise<unknown>;
}

/**
 * Declares API routes once: the Express handler (validate every part with the shared zod
 * schemas, then the handler authorises and acts) and the record the OpenAPI document and the role
 * matrix test are built from — so no route can exist outside both.
 */
export class ApiRoutes {
  readonly specs: RouteSpec[] = [];
  readonly router = Router();

  add<P extends z.ZodType, Q extends z.ZodType, B extends z.ZodType>(
    spec: RouteSpec<P, Q, B>,
  ): void {
    this.specs.push(spec as unknown as RouteSpec);
    this.router[spec.method](
      spec.path,
      ...(spec.before ?? []),
      async (req: Request, res: Response) => {
        const params = spec.params ? parse(spec.params, req, "params") : {};
        const query = spec.query ? parse(spec.query, req, "query") : {};
        const body = spec.body ? parse(spec.body, req, "body") : {};
        const actor = req.user?.actor ?? null;
        const result = await spec.handler({
          req,
          res,
          actor,
          params,
          query,
          body,
        } as never);
        if (res.headersSent) return;
        const status = spec.status ?? 200;
        if (status === 204 || result === undefined)
          res.status(status === 200 ? 204 : status).end();
        else res.status(status).json(result);
      },
    );
  }
}
