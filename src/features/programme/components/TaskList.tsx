import type { ReactNode } from "react";
import type {
  ProgrammeResponse,
  ProgrammeTask,
} from "../../../../shared/schemas";
import {
  Button,
  CautionNote,
  PartyChip,
  StatusBadge,
} from "../../../components/ui";
import { clearFromWhenDone } from "../../../../shared/programme";
import { cautionFor } from "../../../../shared/schemas";
import type { CreateLinkInput } from "../api/create-link";
import type { ProgressInput } from "../api/record-progress";
import {
  daysText,
  dayText,
  finishText,
  partyText,
  startText,
  waitsForText,
  type ProgrammeLink,
  type Row,
} from "../model";
import { EditLinkForm, NewLinkForm, type LinkUpdate } from "./LinkForm";
import { ProgressForm } from "./ProgressForm";
import { TaskForm, type TaskUpdate } from "./TaskForm";

export type OpenForm =
  | { kind: "edit" | "start" | "done" | "remove" | "add-link"; taskId: string }
  | { kind: "edit-link" | "remove-link"; taskId: string; linkId: string };

export interface TaskActions {
  updateTask: (taskId: string, body: TaskUpdate) => Promise<unknown>;
  recordProgress: (taskId: string, body: ProgressInput) => Promise<unknown>;
  deleteTask: (taskId: string) => Promise<unknown>;
  createLink: (body: CreateLinkInput) => Promise<unknown>;
  updateLink: (linkId: string, body: LinkUpdate) => Promise<unknown>;
  deleteLink: (linkId: string) => Promise<unknown>;
  move: (taskId: string, step: -1 | 1) => Promise<unknown>;
}

function Readiness({
  row,
  name,
  isDone,
}: {
  row: Row;
  name: (id: string) => string;
  isDone: (id: string) => boolean;
}) {
  const r = row.result.readiness;
  if (r.state === "done") return <StatusBadge tone="ok">Done</StatusBadge>;
  if (r.state === "started")
    return <StatusBadge tone="accent">Started</StatusBadge>;
  if (r.state === "clear")
    return <StatusBadge tone="ok">Clear to start</StatusBadge>;
  // Everything it waits for is done; only time is left (the rest of that day, a drying lag).
  const from = clearFromWhenDone(
    r.waitingOn.map((w) => ({ ...w, done: isDone(w.task) })),
  );
  if (from)
    return (
      <StatusBadge tone="ok">Clear to start from {dayText(from)}</StatusBadge>
    );
  // Not a StatusBadge: the names can be long, so this one wraps on a phone.
  return (
    <span className="inline-flex max-w-full items-start gap-1.5 rounded border border-wait/40 bg-wait-wash px-2 py-0.5 text-xs font-medium text-ink">
      <span
        aria-hidden="true"
        className="mt-1 size-2 shrink-0 rounded-full bg-wait"
      />
      <span>
        Waiting on{" "}
        {r.waitingOn
          .map((w) => `${name(w.task)} (from ${dayText(w.allowsFrom)})`)
          .join(", ")}
      </span>
    </span>
  );
}

interface TaskListProps {
  programme: ProgrammeResponse;
  rows: Row[];
  /** Stored order with move up / down, instead of the planned order. */
  reordering: boolean;
  open: OpenForm | null;
  onOpen: (open: OpenForm | null) => void;
  actions: TaskActions;
  busy: boolean;
  /** The booking status and "Book a …" control for a trade task (from the bookings feature). */
  renderBooking?: (task: ProgrammeTask) => ReactNode;
  /** The task a link pointed at: its row is marked (and focusable, for the link to land on). */
  selectedTaskId?: string | null;
}

/** "Finished Thu 3 Dec", or "Started Tue 1 Dec, finished Thu 3 Dec": when the work was really done. */
function doneDaysText(
  actualStart: string | null,
  actualFinish: string,
): string {
  const last = dayText(actualFinish);
  const first = actualStart ? dayText(actualStart) : last;
  return first === last
    ? `Finished ${last}`
    : `Started ${first}, finished ${last}`;
}

/** The programme as a list: the main view on a phone, and the keyboard's way to everything. */
export function TaskList({
  programme,
  rows,
  reordering,
  open,
  onOpen,
  actions,
  busy,
  renderBooking,
  selectedTaskId = null,
}: TaskListProps) {
  const name = (id: string) =>
    programme.tasks.find((t) => t.id === id)?.name ?? "a removed task";
  const isDone = (id: string) =>
    !!programme.tasks.find((t) => t.id === id)?.actualFinish;
  const ordered = reordering
    ? [...rows].sort((a, b) => a.task.sortOrder - b.task.sortOrder)
    : rows;
  const close = () => onOpen(null);
  const is = (kind: OpenForm["kind"], taskId: string, linkId?: string) =>
    open?.kind === kind &&
    open.taskId === taskId &&
    (!linkId || ("linkId" in open && open.linkId === linkId));

  return (
    <ol className="flex flex-col divide-y divide-rule" aria-label="Tasks">
      {ordered.map((row, index) => {
        const { task, result: r } = row;
        const caution = cautionFor(task.party, task.hazards);
        const headingId = `task-${task.id}`;
        const waits: ProgrammeLink[] = programme.links.filter(
          (l) => l.toTaskId === task.id,
        );
        const started = !!task.actualStart;
        const done = !!task.actualFinish;
        return (
          <li
            key={task.id}
            id={`task-row-${task.id}`}
            tabIndex={-1}
            aria-labelledby={headingId}
            aria-current={selectedTaskId === task.id ? "true" : undefined}
            className={
              selectedTaskId === task.id
                ? "-mx-2 flex scroll-mt-4 flex-col gap-2 rounded border border-accent/50 bg-accent-wash px-2 py-3 outline-none focus-visible:ring-2 focus-visible:ring-accent"
                : "flex scroll-mt-4 flex-col gap-2 py-3 outline-none first:pt-0 last:pb-0 focus-visible:ring-2 focus-visible:ring-accent"
            }
          >
            <div className="flex flex-wrap items-center gap-x-3 gap-y-1.5">
              <h3 id={headingId} className="font-semibold">
                {task.name}
              </h3>
              <PartyChip party={task.party}>{partyText(task)}</PartyChip>
              <span className="font-mono text-sm text-ink-soft">
                {task.durationDays === 0
                  ? "milestone"
                  : daysText(task.durationDays)}
              </span>
              {r.critical && !done ? (
                <StatusBadge tone="risk">Critical</StatusBadge>
              ) : null}
              <Readiness row={row} name={name} isDone={isDone} />
            </div>
            <p className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
              {done ? (
                // Done: when it was really done, not a plan or its float (issue 16).
                <span className="font-mono">
                  {doneDaysText(task.actualStart, task.actualFinish!)}
                </span>
              ) : (
                <>
                  <span>
                    <span className="text-ink-soft">Planned </span>
                    <span className="font-mono">
                      {r.plannedStart === r.plannedFinish
                        ? finishText(r.plannedFinish)
                        : `${startText(r.plannedStart)} – ${finishText(r.plannedFinish)}`}
                    </span>
                  </span>
                  <span>
                    <span className="text-ink-soft">Float </span>
                    <span className="font-mono">
                      {r.totalFloatDays} working{" "}
                      {Math.abs(r.totalFloatDays) === 1 ? "day" : "days"}
                    </span>
                  </span>
                </>
              )}
              {task.notEarlierThan ? (
                <span>
                  <span className="text-ink-soft">Not earlier than </span>
                  <span className="font-mono">
                    {dayText(task.notEarlierThan)}
                  </span>
                </span>
              ) : null}
              {task.booking && !renderBooking ? (
                <span className="text-ink-soft">
                  Booked: {task.booking.tradeName}
                </span>
              ) : null}
            </p>
            {waits.length > 0 ? (
              <ul className="flex flex-col gap-1 text-sm">
                {waits.map((l) => (
                  <li key={l.id} className="flex flex-col gap-1">
                    <div className="flex flex-wrap items-center gap-x-3">
                      <span>{waitsForText(l, name(l.fromTaskId))}</span>
                      <Button
                        variant="quiet"
                        size="sm"
                        aria-label={`Edit link: ${task.name} waits for ${name(l.fromTaskId)}`}
                        onClick={() =>
                          onOpen({
                            kind: "edit-link",
                            taskId: task.id,
                            linkId: l.id,
                          })
                        }
                      >
                        Edit
                      </Button>
                      <Button
                        variant="quiet-danger"
                        size="sm"
                        aria-label={`Remove link: ${task.name} waits for ${name(l.fromTaskId)}`}
                        onClick={() =>
                          onOpen({
                            kind: "remove-link",
                            taskId: task.id,
                            linkId: l.id,
                          })
                        }
                      >
                        Remove
                      </Button>
                    </div>
                    {is("edit-link", task.id, l.id) ? (
                      <EditLinkForm
                        version={programme.version}
                        link={l}
                        waiting={task.name}
                        waitsFor={name(l.fromTaskId)}
                        onUpdate={(body) => actions.updateLink(l.id, body)}
                        onDone={close}
                      />
                    ) : null}
                    {is("remove-link", task.id, l.id) ? (
                      <div
                        role="alertdialog"
                        aria-label="Remove this link?"
                        className="flex flex-wrap items-center gap-2 rounded border border-risk/40 bg-risk-wash px-3 py-2"
                      >
                        <span>
                          {task.name} will no longer wait for{" "}
                          {name(l.fromTaskId)}.
                        </span>
                        <Button
                          variant="danger"
                          size="sm"
                          busy={busy}
                          onClick={() =>
                            actions.deleteLink(l.id).then(close, () => {})
                          }
                        >
                          Remove link
                        </Button>
                        <Button variant="secondary" size="sm" onClick={close}>
                          Keep it
                        </Button>
                      </div>
                    ) : null}
                  </li>
                ))}
              </ul>
            ) : (
              <p className="text-sm text-ink-soft">Waits for nothing.</p>
            )}
            {r.problems.length > 0 ? (
              <ul className="flex flex-col gap-1 text-sm">
                {r.problems.map((p) => (
                  <li
                    key={p.code + p.message}
                    className="rounded border border-risk/30 bg-risk-wash px-2 py-1"
                  >
                    <span className="font-semibold">Problem: </span>
                    {p.message}
                  </li>
                ))}
              </ul>
            ) : null}
            {caution ? <CautionNote>{caution}</CautionNote> : null}
            {renderBooking && task.party !== "workshop" && !reordering
              ? renderBooking(task)
              : null}
            <div className="flex flex-wrap gap-x-1 gap-y-1">
              {reordering ? (
                <>
                  <Button
                    variant="secondary"
                    size="sm"
                    disabled={index === 0 || busy}
                    aria-label={`Move ${task.name} up`}
                    onClick={() => actions.move(task.id, -1)}
                  >
                    ↑ Up
                  </Button>
                  <Button
                    variant="secondary"
                    size="sm"
                    disabled={index === ordered.length - 1 || busy}
                    aria-label={`Move ${task.name} down`}
                    onClick={() => actions.move(task.id, 1)}
                  >
                    ↓ Down
                  </Button>
                </>
              ) : (
                <>
                  <Button
                    variant="secondary"
                    size="sm"
                    aria-label={`Edit ${task.name}`}
                    onClick={() => onOpen({ kind: "edit", taskId: task.id })}
                  >
                    Edit
                  </Button>
                  <Button
                    variant="secondary"
                    size="sm"
                    aria-label={`Waits for… (add what ${task.name} waits for)`}
                    onClick={() =>
                      onOpen({ kind: "add-link", taskId: task.id })
                    }
                  >
                    Waits for…
                  </Button>
                  {/* A milestone has no duration to start: it is only done. */}
                  {!started && task.durationDays > 0 ? (
                    <Button
                      variant="secondary"
                      size="sm"
                      aria-label={`Mark started: ${task.name}`}
                      onClick={() => onOpen({ kind: "start", taskId: task.id })}
                    >
                      Mark started
                    </Button>
                  ) : null}
                  {!done ? (
                    <Button
                      variant="secondary"
                      size="sm"
                      aria-label={`Mark done: ${task.name}`}
                      onClick={() => onOpen({ kind: "done", taskId: task.id })}
                    >
                      Mark done
                    </Button>
                  ) : null}
                  {started ? (
                    <Button
                      variant="quiet"
                      size="sm"
                      aria-label={`Not started after all: ${task.name}`}
                      disabled={busy}
                      onClick={() =>
                        actions
                          .recordProgress(task.id, {
                            version: programme.version,
                            actualStart: null,
                            actualFinish: null,
                          })
                          .catch(() => {})
                      }
                    >
                      Not started after all
                    </Button>
                  ) : null}
                  <Button
                    variant="quiet-danger"
                    size="sm"
                    aria-label={`Remove ${task.name}`}
                    onClick={() => onOpen({ kind: "remove", taskId: task.id })}
                  >
                    Remove
                  </Button>
                </>
              )}
            </div>
            {is("edit", task.id) ? (
              <TaskForm
                version={programme.version}
                task={task}
                onUpdate={(body) => actions.updateTask(task.id, body)}
                onDone={close}
              />
            ) : null}
            {is("add-link", task.id) ? (
              <NewLinkForm
                version={programme.version}
                tasks={programme.tasks}
                waitingTaskId={task.id}
                onCreate={actions.createLink}
                onDone={close}
              />
            ) : null}
            {is("start", task.id) || is("done", task.id) ? (
              <ProgressForm
                version={programme.version}
                task={task}
                mode={open?.kind === "start" ? "start" : "done"}
                plannedStart={r.plannedStart}
                today={programme.dataDate}
                onSave={(body) => actions.recordProgress(task.id, body)}
                onDone={close}
              />
            ) : null}
            {is("remove", task.id) ? (
              <div
                role="alertdialog"
                aria-label={`Remove ${task.name}?`}
                className="flex flex-wrap items-center gap-2 rounded border border-risk/40 bg-risk-wash px-3 py-2 text-sm"
              >
                <span>
                  Remove {task.name} and its links? This cannot be undone.
                </span>
                <Button
                  variant="danger"
                  size="sm"
                  busy={busy}
                  onClick={() =>
                    actions.deleteTask(task.id).then(close, () => {})
                  }
                >
                  Remove task
                </Button>
                <Button variant="secondary" size="sm" onClick={close}>
                  Keep it
                </Button>
              </div>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}
