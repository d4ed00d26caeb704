import {
  markReadBodySchema,
  markReadResponseSchema,
  postMessageBodySchema,
  postMessageFieldsSchema,
  threadAttachmentParamsSchema,
  threadAttachmentQuerySchema,
  threadMessageSchema,
  threadParamsSchema,
  threadQuerySchema,
  threadResponseSchema,
  unreadResponseSchema,
} from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";
import {
  getThread,
  markRead,
  postMessage,
  postMessageWithFiles,
  sendAttachment,
  unreadSummary,
  type ThreadDeps,
} from "./thread.service";

export function registerThreadRoutes(api: ApiRoutes, deps: ThreadDeps): void {
  api.add({
    method: "get",
    path: "/jobs/:jobId/thread",
    tag: "thread",
    summary:
      "The job's thread as the signed-in person sees it (their audiences only); `after` returns only newer messages, for polling",
    params: threadParamsSchema,
    query: threadQuerySchema,
    response: threadResponseSchema,
    handler: ({ actor, params, query }) =>
      getThread(deps.ds, actor, params.jobId, query),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/thread/messages",
    tag: "thread",
    summary: "Post a text message to one audience the person may post to",
    params: threadParamsSchema,
    body: postMessageBodySchema,
    response: threadMessageSchema,
    status: 201,
    handler: ({ actor, params, body }) =>
      postMessage(deps, actor, params.jobId, body),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/thread/messages/upload",
    tag: "thread",
    summary:
      "Post a message with files (multipart/form-data: `audience`, `text`, and 1–5 `file` parts)",
    params: threadParamsSchema,
    multipart: postMessageFieldsSchema,
    response: threadMessageSchema,
    status: 201,
    handler: ({ actor, params, req, res }) =>
      postMessageWithFiles(deps, actor, params.jobId, req, res),
  });
  api.add({
    method: "get",
    path: "/jobs/:jobId/thread/attachments/:fileId",
    tag: "thread",
    summary:
      "Download a file attached to a message the person can see (`inline=1` to view, `variant=thumbnail` for an image's preview)",
    params: threadAttachmentParamsSchema,
    query: threadAttachmentQuerySchema,
    handler: ({ actor, params, query, res }) =>
      sendAttachment(deps, actor, params.jobId, params.fileId, query, res),
  });
  api.add({
    method: "post",
    path: "/jobs/:jobId/thread/read",
    tag: "thread",
    summary:
      "Mark the thread read up to a message (default: everything the person can see now)",
    params: threadParamsSchema,
    body: markReadBodySchema,
    response: markReadResponseSchema,
    handler: ({ actor, params, body }) =>
      markRead(deps.ds, actor, params.jobId, body.seq),
  });
  api.add({
    method: "get",
    path: "/thread/unread",
    tag: "thread",
    summary:
      "The signed-in person's jobs with unread thread messages, with counts",
    response: unreadResponseSchema,
    handler: ({ actor }) => unreadSummary(deps.ds, actor),
  });
}
