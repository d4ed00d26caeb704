import { useMutation, useQueryClient } from "@tanstack/react-query";
import type {
  PostMessageBody,
  ThreadAudience,
} from "../../../../shared/schemas";
import { api } from "../../../lib/api-client";
import { uploadWithProgress } from "../../../lib/upload";
import { threadKeys } from "./keys";
import { threadPaths } from "./paths";

export interface SendMessageInput {
  audience: ThreadAudience;
  text: string;
  files: File[];
  /** Upload progress, 0 to 1, while files are sent. */
  onProgress?: (fraction: number) => void;
}

/** `POST …/thread/messages` (JSON) without files; multipart to `…/messages/upload` with them. */
export function sendMessage(
  jobId: string,
  { audience, text, files, onProgress }: SendMessageInput,
): Promise<unknown> {
  if (files.length === 0) {
    const body: PostMessageBody = { audience, text };
    return api.post<unknown>(threadPaths.messages(jobId), body);
  }
  const form = new FormData();
  // Text fields first: the server reads them after streaming the files, but order costs nothing.
  form.append("audience", audience);
  form.append("text", text);
  for (const f of files) form.append("file", f, f.name);
  return uploadWithProgress<unknown>(
    threadPaths.upload(jobId),
    form,
    onProgress ?? (() => undefined),
  );
}

/** Sends, then fetches what is new at once (the message itself, and anyone else's meanwhile). */
export function useSendMessage(jobId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: SendMessageInput) => sendMessage(jobId, input),
    onSuccess: () => client.refetchQueries({ queryKey: threadKeys.job(jobId) }),
  });
}
