import { z } from "zod";
import {
  createInvitationBodySchema,
  idSchema,
  invitationResponseSchema,
  memberResponseSchema,
  settingsPreviewResponseSchema,
  updateWorkshopBodySchema,
  workshopResponseSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import { authorize } from "../../policies";
import { invite, type AuthDeps } from "../auth/auth.service";
import {
  getWorkshop,
  listInvitations,
  listMembers,
  previewSettings,
  updateWorkshop,
  type ReplanHook,
} from "./workshops.service";

const params = z.object({ workshopId: idSchema });

/** The workshop routes; `replan` re-confirms the bookings a settings change moves (app.ts wires it). */
export function registerWorkshopRoutes(
  api: ApiRoutes,
  deps: AuthDeps,
  replan?: ReplanHook,
): void {
  const { ds } = deps;
  api.add({
    method: "get",
    path: "/workshops/:workshopId",
    tag: "workshops",
    summary: "The workshop's settings",
    params,
    response: workshopResponseSchema,
    handler: async ({ actor, params }) =>
      getWorkshop(ds, actor, params.workshopId),
  });
  api.add({
    method: "patch",
    path: "/workshops/:workshopId",
    tag: "workshops",
    summary: "Change the workshop's settings (owner)",
    params,
    body: updateWorkshopBodySchema,
    response: workshopResponseSchema,
    handler: async ({ actor, params, body }) =>
      updateWorkshop(ds, actor, params.workshopId, body, replan),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/settings/preview",
    tag: "workshops",
    summary:
      "What a settings change would do to the open jobs, before it is made: finish before and after, handover at risk, bookings to re-confirm (owner)",
    params,
    body: updateWorkshopBodySchema,
    response: settingsPreviewResponseSchema,
    handler: async ({ actor, params, body }) =>
      previewSettings(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/members",
    tag: "workshops",
    summary: "Owners and fitters (owner)",
    params,
    response: z.object({ members: z.array(memberResponseSchema) }),
    handler: async ({ actor, params }) => ({
      members: await listMembers(ds, actor, params.workshopId),
    }),
  });
  api.add({
    method: "get",
    path: "/workshops/:workshopId/invitations",
    tag: "workshops",
    summary: "Invitations sent (owner)",
    params,
    response: z.object({ invitations: z.array(invitationResponseSchema) }),
    handler: async ({ actor, params }) => ({
      invitations: await listInvitations(ds, actor, params.workshopId),
    }),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/invitations",
    tag: "workshops",
    summary: "Invite a fitter, a trade contact or a customer by e-mail (owner)",
    params,
    body: createInvitationBodySchema,
    status: 201,
    response: invitationResponseSchema,
    handler: async ({ actor, req, params, body }) => {
      authorize(actor, "invitations.manage", {
        kind: "workshop",
        workshopId: params.workshopId,
      });
      const by = { userId: actor.userId, name: req.user!.user.name };
      const record = await invite(deps, by, params.workshopId, body);
      return {
        id: record.id,
        name: body.name,
        email: body.email,
        role: body.role,
        expiresAt: record.expiresAt.toISOString(),
        acceptedAt: null,
        createdAt: new Date().toISOString(),
        // Only that an account exists (they will be asked to sign in and link it), never where.
        existingAccount: record.existingAccount,
      };
    },
  });
}
