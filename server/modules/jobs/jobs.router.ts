import { z } from "zod";
import type { DataSource } from "typeorm";
import {
  createJobBodySchema,
  idSchema,
  jobDetailSchema,
  jobSummarySchema,
  updateJobBodySchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import type { FilesDeps } from "../files/files.service";
import {
  createJob,
  deleteJob,
  getJob,
  listJobs,
  updateJob,
} from "./jobs.service";

const jobParams = z.object({ jobId: idSchema });
const workshopParams = z.object({ workshopId: idSchema });

export function registerJobRoutes(
  api: ApiRoutes,
  ds: DataSource,
  files?: FilesDeps,
): void {
  api.add({
    method: "get",
    path: "/jobs",
    tag: "jobs",
    summary: "Every job the signed-in person may see",
    response: z.object({ jobs: z.array(jobSummarySchema) }),
    handler: async ({ actor }) => ({ jobs: await listJobs(ds, actor) }),
  });
  api.add({
    method: "get",
    path: "/jobs/:jobId",
    tag: "jobs",
    summary: "One job, as the signed-in person may see it",
    params: jobParams,
    response: jobDetailSchema,
    handler: async ({ actor, params }) => getJob(ds, actor, params.jobId),
  });
  api.add({
    method: "post",
    path: "/workshops/:workshopId/jobs",
    tag: "jobs",
    summary: "Create a job",
    params: workshopParams,
    body: createJobBodySchema,
    status: 201,
    response: jobDetailSchema,
    handler: async ({ actor, params, body }) =>
      createJob(ds, actor, params.workshopId, body),
  });
  api.add({
    method: "patch",
    path: "/jobs/:jobId",
    tag: "jobs",
    summary:
      "Edit a job's details (carries the version you saw; 409 if it changed)",
    params: jobParams,
    body: updateJobBodySchema,
    response: jobDetailSchema,
    handler: async ({ actor, params, body }) =>
      updateJob(ds, actor, params.jobId, body),
  });
  api.add({
    method: "delete",
    path: "/jobs/:jobId",
    tag: "jobs",
    summary: "Delete a job (owner only)",
    params: jobParams,
    status: 204,
    handler: async ({ actor, params }) =>
      deleteJob(ds, actor, params.jobId, files),
  });
}
