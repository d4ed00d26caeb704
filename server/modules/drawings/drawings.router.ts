import {
  addRevisionFieldsSchema,
  createDrawingFieldsSchema,
  drawingDetailSchema,
  drawingFileQuerySchema,
  drawingParamsSchema,
  drawingRevisionParamsSchema,
  jobDrawingsParamsSchema,
  jobDrawingsResponseSchema,
  updateDrawingBodySchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import {
  addRevision,
  createDrawing,
  deleteDrawing,
  getDrawing,
  listJobDrawings,
  sendRevisionFile,
  updateDrawing,
  type DrawingDeps,
} from "./drawings.service";

export function registerDrawingRoutes(api: ApiRoutes, deps: DrawingDeps): void {
  const { ds } = deps;
  api.add({
    method: "get",
    path: "/jobs/:jobId/drawings",
    tag: "drawings",
    summary:
      "The job's drawings, templates and site photos the signed-in person may see",
    params: jobDrawingsParamsSchema,
    response: jobDrawingsResponseSchema,
    handler: async ({ actor, params }) =>
      listJobDrawings(ds, actor, params.jobId),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/drawings",
    tag: "drawings",
    summary:
      "Upload a drawing, template or site photo (multipart: file + fields); it becomes Rev A",
    params: jobDrawingsParamsSchema,
    multipart: createDrawingFieldsSchema,
    status: 201,
    response: drawingDetailSchema,
    handler: async ({ actor, params, req, res }) =>
      createDrawing(deps, actor, params.jobId, req, res),
  });
  api.add({
    method: "get",
    path: "/drawings/:drawingId",
    tag: "drawings",
    summary:
      "One drawing: sharing, every revision, and its tasks with the programme's readiness",
    params: drawingParamsSchema,
    response: drawingDetailSchema,
    handler: async ({ actor, params }) =>
      getDrawing(ds, actor, params.drawingId),
  });
  api.add({
    method: "patch",
    path: "/drawings/:drawingId",
    tag: "drawings",
    summary: "Rename a drawing, change whom it is shared with or its tasks",
    params: drawingParamsSchema,
    body: updateDrawingBodySchema,
    response: drawingDetailSchema,
    handler: async ({ actor, params, body }) =>
      updateDrawing(deps, actor, params.drawingId, body),
  });
  api.add({
    method: "delete",
    path: "/drawings/:drawingId",
    tag: "drawings",
    summary: "Delete a drawing with every revision and its files (owner only)",
    params: drawingParamsSchema,
    status: 204,
    handler: async ({ actor, params }) =>
      deleteDrawing(deps, actor, params.drawingId),
  });
  api.add({
    method: "post",
    path: "/drawings/:drawingId/revisions",
    tag: "drawings",
    summary:
      "Upload the next revision (Rev B, C … Z; multipart: file + note); earlier revisions stay",
    params: drawingParamsSchema,
    multipart: addRevisionFieldsSchema,
    status: 201,
    response: drawingDetailSchema,
    handler: async ({ actor, params, req, res }) =>
      addRevision(deps, actor, params.drawingId, req, res),
  });
  api.add({
    method: "get",
    path: "/drawings/:drawingId/revisions/:letter/file",
    tag: "drawings",
    summary:
      "Download one revision's file (?inline=1 previews a PDF or image in the browser)",
    params: drawingRevisionParamsSchema,
    query: drawingFileQuerySchema,
    handler: async ({ actor, params, query, res }) =>
      sendRevisionFile(deps, actor, params.drawingId, params.letter, res, {
        variant: "original",
        inline: query.inline,
      }),
  });
  api.add({
    method: "get",
    path: "/drawings/:drawingId/revisions/:letter/thumbnail",
    tag: "drawings",
    summary: "A small WebP preview of an image revision",
    params: drawingRevisionParamsSchema,
    handler: async ({ actor, params, res }) =>
      sendRevisionFile(deps, actor, params.drawingId, params.letter, res, {
        variant: "thumbnail",
        inline: true,
      }),
  });
}
