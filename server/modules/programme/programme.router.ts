import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  applyResponseSchema,
  changeBodySchema,
  createLinkBodySchema,
  createTaskBodySchema,
  createTaskResponseSchema,
  idSchema,
  previewResponseSchema,
  programmeEditSchema,
  programmeResponseSchema,
  progressBodySchema,
  reorderBodySchema,
  updateLinkBodySchema,
  updateTaskBodySchema,
  versionQuerySchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import {
  applyChange,
  createLink,
  createTask,
  deleteLink,
  deleteTask,
  getProgramme,
  previewChange,
  recordProgress,
  reorderTasks,
  updateLink,
  updateTask,
  type AfterApply,
} from "./programme.service";

const job = z.object({ jobId: idSchema });
const task = job.extend({ taskId: idSchema });
const link = job.extend({ linkId: idSchema });
const tag = "programme";

export function registerProgrammeRoutes(
  api: ApiRoutes,
  ds: DataSource,
  afterApply?: AfterApply,
): void {
  api.add({
    method: "get",
    path: "/jobs/:jobId/programme",
    tag,
    summary:
      "The job's programme, computed: dates, float, driving path, readiness, problems",
    params: job,
    response: programmeResponseSchema,
    handler: async ({ actor, params }) => getProgramme(ds, actor, params.jobId),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/tasks",
    tag,
    summary: "Add a task; answers with its id and what changed",
    params: job,
    body: createTaskBodySchema,
    status: 201,
    response: createTaskResponseSchema,
    handler: async ({ actor, params, body }) =>
      createTask(ds, actor, params.jobId, body),
  });
  api.add({
    method: "patch",
    path: "/jobs/:jobId/tasks/:taskId",
    tag,
    summary:
      "Edit a task; answers with what changed (the task, moved dates, version)",
    params: task,
    body: updateTaskBodySchema,
    response: programmeEditSchema,
    handler: async ({ actor, params, body }) =>
      updateTask(ds, actor, params.jobId, params.taskId, body),
  });
  api.add({
    method: "delete",
    path: "/jobs/:jobId/tasks/:taskId",
    tag,
    summary: "Remove a task (and its links)",
    params: task,
    query: versionQuerySchema,
    response: programmeEditSchema,
    handler: async ({ actor, params, query }) =>
      deleteTask(ds, actor, params.jobId, params.taskId, query.version),
  });
  api.add({
    method: "put",
    path: "/jobs/:jobId/tasks/order",
    tag,
    summary: "Reorder the tasks",
    params: job,
    body: reorderBodySchema,
    response: programmeEditSchema,
    handler: async ({ actor, params, body }) =>
      reorderTasks(ds, actor, params.jobId, body),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/tasks/:taskId/progress",
    tag,
    summary: "Mark a task started or done, with its actual dates",
    params: task,
    body: progressBodySchema,
    response: programmeEditSchema,
    handler: async ({ actor, params, body }) =>
      recordProgress(ds, actor, params.jobId, params.taskId, body),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/links",
    tag,
    summary: 'Add a "waits for" link (a loop is refused with 422)',
    params: job,
    body: createLinkBodySchema,
    status: 201,
    response: programmeEditSchema,
    handler: async ({ actor, params, body }) =>
      createLink(ds, actor, params.jobId, body),
  });
  api.add({
    method: "patch",
    path: "/jobs/:jobId/links/:linkId",
    tag,
    summary: "Edit a link's kind or lag",
    params: link,
    body: updateLinkBodySchema,
    response: programmeEditSchema,
    handler: async ({ actor, params, body }) =>
      updateLink(ds, actor, params.jobId, params.linkId, body),
  });
  api.add({
    method: "delete",
    path: "/jobs/:jobId/links/:linkId",
    tag,
    summary: "Remove a link",
    params: link,
    query: versionQuerySchema,
    response: programmeEditSchema,
    handler: async ({ actor, params, query }) =>
      deleteLink(ds, actor, params.jobId, params.linkId, query.version),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/programme/preview",
    tag,
    summary: "The knock-on of a proposed change, without saving",
    params: job,
    body: changeBodySchema,
    response: previewResponseSchema,
    handler: async ({ actor, params, body }) =>
      previewChange(ds, actor, params.jobId, body.version, body.changes),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/programme/apply",
    tag,
    summary: "Apply a change; the server recomputes its knock-on",
    params: job,
    body: changeBodySchema,
    response: applyResponseSchema,
    handler: async ({ actor, params, body }) =>
      applyChange(
        ds,
        actor,
        params.jobId,
        body.version,
        body.changes,
        afterApply,
      ),
  });
}
