import { useMemo, useRef, useState, type ReactNode } from "react";
import type {
  ProgrammeResponse,
  ProgrammeTask,
} from "../../../../shared/schemas";
import { ProgrammeInputError } from "../../../../shared/programme";
import {
  Button,
  EmptyState,
  ErrorState,
  FormError,
  LoadingState,
  Section,
} from "../../../components/ui";
import { errorMessage, isApiError } from "../../../lib/api-client";
import { useApplyChange, type ApplyAnswer } from "../api/apply-change";
import { useCreateLink, type CreateLinkInput } from "../api/create-link";
import { useCreateTask, type CreateTaskInput } from "../api/create-task";
import { useDeleteLink } from "../api/delete-link";
import { useDeleteTask } from "../api/delete-task";
import { useProgramme } from "../api/get-programme";
import { useRecordProgress, type ProgressInput } from "../api/record-progress";
import { useReorderTasks } from "../api/reorder-tasks";
import { useUpdateLink } from "../api/update-link";
import { useUpdateTask } from "../api/update-task";
import {
  dayText,
  finishText,
  previewMove,
  rowsOf,
  workingDaysText,
  type Preview,
} from "../model";
import { BarView } from "./BarView";
import { ImpactSummary, KnockOnPanel } from "./KnockOnPanel";
import { NewLinkForm, type LinkUpdate } from "./LinkForm";
import { TaskForm, type TaskUpdate } from "./TaskForm";
import { TaskList, type OpenForm, type TaskActions } from "./TaskList";

interface Undo {
  label: string;
  run: (version: number) => Promise<unknown>;
}

function Summary({ programme }: { programme: ProgrammeResponse }) {
  const r = programme.result;
  const slip = r.handoverSlipDays;
  return (
    <dl className="mb-4 flex flex-wrap gap-x-6 gap-y-2 text-sm">
      <div>
        <dt className="text-ink-soft">Today</dt>
        <dd className="font-mono">{dayText(programme.dataDate)}</dd>
      </div>
      <div>
        <dt className="text-ink-soft">Agreed handover</dt>
        <dd className="font-mono">
          {programme.handover ? dayText(programme.handover) : "Not set"}
        </dd>
      </div>
      <div>
        <dt className="text-ink-soft">Planned finish</dt>
        <dd className="font-mono" data-testid="planned-finish">
          {r.finish ? finishText(r.finish) : "—"}
        </dd>
      </div>
      {slip !== null ? (
        <div>
          <dt className="text-ink-soft">Against the agreed handover</dt>
          <dd className={slip > 0 ? "font-medium text-risk" : "text-ok"}>
            {slip > 0
              ? `${workingDaysText(slip)} late — agreed handover at risk`
              : "On time"}
          </dd>
        </div>
      ) : null}
    </dl>
  );
}

interface ProgrammeScreenProps {
  jobId: string;
  /** A task a link pointed at (`?task=<id>`): its row is marked and can take focus. */
  selectedTaskId?: string | null;
  /**
   * A trade task's booking control, supplied by the route (bookings are another feature);
   * `refresh` re-reads the programme after a booking pins or frees the task.
   */
  renderBooking?: (task: ProgrammeTask, refresh: () => void) => ReactNode;
  /** After any saved change: a move may re-book tasks on the server (needs re-confirming). */
  onChanged?: () => void;
}

/** The maker's programme screen: list, bar view, instant knock-on, forms. */
export function ProgrammeScreen({
  jobId,
  selectedTaskId = null,
  renderBooking,
  onChanged,
}: ProgrammeScreenProps) {
  const programme = useProgramme(jobId);
  const createTask = useCreateTask(jobId);
  const updateTask = useUpdateTask(jobId);
  const deleteTask = useDeleteTask(jobId);
  const reorder = useReorderTasks(jobId);
  const progress = useRecordProgress(jobId);
  const createLink = useCreateLink(jobId);
  const updateLink = useUpdateLink(jobId);
  const deleteLink = useDeleteLink(jobId);
  const apply = useApplyChange(jobId);

  const [preview, setPreview] = useState<Preview | null>(null);
  const [previewError, setPreviewError] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<string | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const [saved, setSaved] = useState<{
    text: string;
    impact?: ApplyAnswer["impact"];
  } | null>(null);
  const [undo, setUndo] = useState<Undo | null>(null);
  const [open, setOpen] = useState<OpenForm | null>(null);
  const [adding, setAdding] = useState<"task" | "link" | null>(null);
  const [reordering, setReordering] = useState(false);
  const knockOnHeading = useRef<HTMLHeadingElement>(null);

  const p = programme.data;
  const rows = useMemo(() => (p ? rowsOf(p.tasks, p.result) : []), [p]);
  const busy =
    deleteTask.isPending ||
    deleteLink.isPending ||
    reorder.isPending ||
    progress.isPending;

  if (programme.isPending)
    return <LoadingState label="Loading the programme…" />;
  if (programme.isError)
    return (
      <ErrorState error={programme.error} onRetry={() => programme.refetch()} />
    );
  const prog = programme.data;
  const taskName = (id: string) =>
    prog.tasks.find((t) => t.id === id)?.name ?? "the task";

  /** Every edit goes through here: a stale version shows who changed what, with a reload. */
  async function run<T>(
    fn: () => Promise<T>,
    makeUndo?: (answer: T) => Undo | null,
    text?: string,
  ): Promise<T> {
    setActionError(null);
    try {
      const answer = await fn();
      onChanged?.();
      setSaved(text ? { text } : null);
      setUndo(makeUndo ? makeUndo(answer) : null);
      return answer;
    } catch (error) {
      if (isApiError(error) && error.code === "version-conflict") {
        setConflict(error.message);
      } else {
        setActionError(errorMessage(error));
      }
      throw error;
    }
  }

  const reload = async () => {
    setConflict(null);
    setPreview(null);
    setSaveError(null);
    setActionError(null);
    setUndo(null);
    await programme.refetch();
  };

  const actions: TaskActions = {
    updateTask: (taskId, body: TaskUpdate) => {
      const before = prog.tasks.find((t) => t.id === taskId)!;
      const old: Record<string, unknown> = {};
      for (const k of Object.keys(body))
        if (k !== "version") old[k] = before[k as keyof typeof before];
      return run(
        () => updateTask.mutateAsync({ taskId, body }),
        () => ({
          label: `Undo the edit to ${before.name}`,
          run: (version) =>
            updateTask.mutateAsync({ taskId, body: { ...old, version } }),
        }),
        `${before.name} saved.`,
      );
    },
    recordProgress: (taskId, body: ProgressInput) => {
      const before = prog.tasks.find((t) => t.id === taskId)!;
      return run(
        () => progress.mutateAsync({ taskId, body }),
        () => ({
          label: `Undo the progress on ${before.name}`,
          run: (version) =>
            progress.mutateAsync({
              taskId,
              body: {
                version,
                actualStart: before.actualStart,
                actualFinish: before.actualFinish,
              },
            }),
        }),
        body.actualFinish
          ? `${before.name} marked done.`
          : body.actualStart
            ? `${before.name} marked started.`
            : `${before.name} is not started.`,
      );
    },
    deleteTask: (taskId) =>
      run(
        () => deleteTask.mutateAsync({ taskId, version: prog.version }),
        undefined,
        `${taskName(taskId)} removed.`,
      ),
    createLink: (body: CreateLinkInput) => {
      const known = new Set(prog.links.map((l) => l.id));
      return run(
        () => createLink.mutateAsync(body),
        (after) => {
          const added = after.links.find((l) => !known.has(l.id));
          return added
            ? {
                label: "Undo the new link",
                run: (version) =>
                  deleteLink.mutateAsync({ linkId: added.id, version }),
              }
            : null;
        },
        `${taskName(body.toTaskId)} now waits for ${taskName(body.fromTaskId)}.`,
      );
    },
    updateLink: (linkId, body: LinkUpdate) => {
      const before = prog.links.find((l) => l.id === linkId)!;
      return run(
        () => updateLink.mutateAsync({ linkId, body }),
        () => ({
          label: "Undo the link change",
          run: (version) =>
            updateLink.mutateAsync({
              linkId,
              body: {
                version,
                kind: before.kind,
                lag: before.lag,
                lagUnit: before.lagUnit,
              },
            }),
        }),
        "Link saved.",
      );
    },
    deleteLink: (linkId) => {
      const before = prog.links.find((l) => l.id === linkId)!;
      return run(
        () => deleteLink.mutateAsync({ linkId, version: prog.version }),
        () => ({
          label: "Undo: put the link back",
          run: (version) =>
            createLink.mutateAsync({
              version,
              fromTaskId: before.fromTaskId,
              toTaskId: before.toTaskId,
              kind: before.kind,
              lag: before.lag,
              lagUnit: before.lagUnit,
            }),
        }),
        "Link removed.",
      );
    },
    move: (taskId, step) => {
      const order = [...prog.tasks]
        .sort((a, b) => a.sortOrder - b.sortOrder)
        .map((t) => t.id);
      const i = order.indexOf(taskId);
      const j = i + step;
      if (j < 0 || j >= order.length) return Promise.resolve();
      const next = [...order];
      [next[i], next[j]] = [next[j], next[i]];
      return run(
        () => reorder.mutateAsync({ version: prog.version, taskIds: next }),
        () => ({
          label: "Undo the reorder",
          run: (version) => reorder.mutateAsync({ version, taskIds: order }),
        }),
      ).catch(() => {});
    },
  };

  const onPreview = (taskId: string, date: string) => {
    setSaved(null);
    setSaveError(null);
    try {
      setPreview(previewMove(prog, taskId, date));
      setPreviewError(null);
    } catch (error) {
      setPreviewError(
        error instanceof ProgrammeInputError
          ? error.problems.join(" ")
          : errorMessage(error),
      );
    }
  };
  const cancelPreview = () => {
    setPreview(null);
    setSaveError(null);
  };
  const savePreview = async () => {
    if (!preview) return;
    const task = prog.tasks.find((t) => t.id === preview.taskId);
    const previous = task?.notEarlierThan ?? null;
    setSaveError(null);
    try {
      const answer = await run(
        () =>
          apply.mutateAsync({
            version: prog.version,
            changes: [
              {
                taskId: preview.taskId,
                notEarlierThan: preview.notEarlierThan,
              },
            ],
          }),
        () => ({
          label: `Undo the move of ${task?.name ?? "the task"}`,
          run: (version) =>
            apply.mutateAsync({
              version,
              changes: [{ taskId: preview.taskId, notEarlierThan: previous }],
            }),
        }),
      );
      setPreview(null);
      setSaved({
        text: `${task?.name ?? "The task"} moved. The server's knock-on:`,
        impact: answer.impact,
      });
    } catch (error) {
      setSaveError(errorMessage(error));
    }
  };

  const runUndo = async () => {
    if (!undo) return;
    const u = undo;
    setUndo(null);
    try {
      await run(() => u.run(prog.version), undefined, "Undone.");
    } catch {
      // run() has shown the problem.
    }
  };

  const shownResult = preview?.result ?? prog.result;

  return (
    <div className="flex flex-col gap-6">
      {conflict ? (
        <div
          role="alert"
          className="flex flex-col gap-2 rounded border border-wait/60 border-l-4 border-l-wait bg-wait-wash px-4 py-3"
        >
          <p className="font-semibold">
            This programme changed since you loaded it
          </p>
          <p className="text-sm">{conflict}</p>
          <Button size="sm" className="self-start" onClick={reload}>
            Reload the programme
          </Button>
        </div>
      ) : null}
      <FormError message={actionError} />
      {saved || undo ? (
        <div
          role="status"
          className="flex flex-col gap-2 rounded border border-ok/40 bg-ok-wash px-4 py-3 text-sm"
        >
          <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
            {saved ? <span>{saved.text}</span> : null}
            {undo ? (
              <Button variant="quiet" size="sm" onClick={runUndo}>
                {undo.label}
              </Button>
            ) : null}
          </div>
          {saved?.impact ? (
            <ImpactSummary programme={prog} impact={saved.impact} />
          ) : null}
        </div>
      ) : null}

      <Summary programme={prog} />

      {prog.tasks.length === 0 ? (
        <Section title="Tasks" id="programme-tasks">
          {adding === "task" ? (
            <TaskForm
              version={prog.version}
              onCreate={(body: CreateTaskInput) =>
                run(
                  () => createTask.mutateAsync(body),
                  (a) => ({
                    label: "Undo: remove the new task",
                    run: (version) =>
                      deleteTask.mutateAsync({ taskId: a.taskId, version }),
                  }),
                  `${body.name} added.`,
                )
              }
              onDone={() => setAdding(null)}
            />
          ) : (
            <EmptyState
              title="No tasks yet — add the first"
              action={
                <Button onClick={() => setAdding("task")}>Add task</Button>
              }
            >
              Each task is one piece of work by the workshop or one trade.
            </EmptyState>
          )}
        </Section>
      ) : (
        <>
          {/* On a phone the list comes first; at a desk the bar view leads. */}
          <Section
            title="Bar view"
            id="programme-bars"
            className="max-md:order-2"
            description="Working days across; hatched days are days off for that task. Drag a bar, or focus it and use ← →, to try a move."
          >
            <BarView
              programme={prog}
              result={shownResult}
              preview={preview}
              onPreview={onPreview}
              onReview={() => knockOnHeading.current?.focus()}
              onCancel={cancelPreview}
            />
            <FormError message={previewError} className="mt-3" />
            {preview ? (
              <div className="mt-4">
                <KnockOnPanel
                  programme={prog}
                  preview={preview}
                  saving={apply.isPending}
                  error={saveError}
                  onSave={savePreview}
                  onCancel={cancelPreview}
                  headingRef={knockOnHeading}
                />
              </div>
            ) : null}
          </Section>

          <Section
            title="Tasks"
            id="programme-tasks"
            className="max-md:order-1"
            description={
              reordering
                ? "In the stored order: move a task up or down."
                : "In the order they are planned to start."
            }
            actions={
              <>
                <Button
                  size="sm"
                  onClick={() => setAdding(adding === "task" ? null : "task")}
                  aria-expanded={adding === "task"}
                >
                  Add task
                </Button>
                <Button
                  size="sm"
                  variant="secondary"
                  onClick={() => setAdding(adding === "link" ? null : "link")}
                  aria-expanded={adding === "link"}
                >
                  Add link
                </Button>
                <Button
                  size="sm"
                  variant="secondary"
                  aria-pressed={reordering}
                  onClick={() => setReordering(!reordering)}
                >
                  {reordering ? "Done reordering" : "Change the order"}
                </Button>
              </>
            }
          >
            {adding === "task" ? (
              <div className="mb-4">
                <TaskForm
                  version={prog.version}
                  onCreate={(body: CreateTaskInput) =>
                    run(
                      () => createTask.mutateAsync(body),
                      (a) => ({
                        label: "Undo: remove the new task",
                        run: (version) =>
                          deleteTask.mutateAsync({ taskId: a.taskId, version }),
                      }),
                      `${body.name} added.`,
                    )
                  }
                  onDone={() => setAdding(null)}
                />
              </div>
            ) : null}
            {adding === "link" ? (
              <div className="mb-4">
                <NewLinkForm
                  version={prog.version}
                  tasks={prog.tasks}
                  onCreate={actions.createLink}
                  onDone={() => setAdding(null)}
                />
              </div>
            ) : null}
            <TaskList
              programme={prog}
              rows={rows}
              reordering={reordering}
              open={open}
              onOpen={setOpen}
              actions={actions}
              busy={busy}
              selectedTaskId={selectedTaskId}
              renderBooking={
                renderBooking
                  ? (task) =>
                      renderBooking(task, () => void programme.refetch())
                  : undefined
              }
            />
          </Section>
        </>
      )}
    </div>
  );
}
