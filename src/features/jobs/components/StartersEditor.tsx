import { useState } from "react";
import {
  starterBodySchema,
  type StarterResponse,
} from "../../../../shared/schemas";
import {
  Button,
  EmptyState,
  ErrorState,
  FormError,
  LoadingState,
  TextField,
} from "../../../components/ui";
import { errorMessage, isApiError } from "../../../lib/api-client";
import { formatDays } from "../../../lib/format";
import { linkKindLabels, partyLabels } from "../../../lib/labels";
import { useDeleteStarter } from "../api/delete-starter";
import { useStarters } from "../api/list-starters";
import { useUpdateStarter } from "../api/update-starter";

type Draft = Pick<StarterResponse, "name" | "description" | "tasks" | "links">;

/** The server's or the schema's per-field messages, as one line each ("Task 2: …"). */
function problemsOf(fields: Record<string, string[]>): string[] {
  return Object.entries(fields).map(([path, msgs]) => {
    const m = /^(tasks|links)\.(\d+)/.exec(path);
    const where = m
      ? `${m[1] === "tasks" ? "Task" : "Link"} ${Number(m[2]) + 1}: `
      : "";
    return `${where}${msgs.join(" ")}`;
  });
}

function StarterForm({
  workshopId,
  starter,
  onDone,
}: {
  workshopId: string;
  starter: StarterResponse;
  onDone: () => void;
}) {
  const update = useUpdateStarter(workshopId);
  const [draft, setDraft] = useState<Draft>({
    name: starter.name,
    description: starter.description,
    tasks: starter.tasks,
    links: starter.links,
  });
  const [problems, setProblems] = useState<string[]>([]);
  const nameOf = (key: string) =>
    draft.tasks.find((t) => t.key === key)?.name ?? key;

  const save = () => {
    const parsed = starterBodySchema.safeParse(draft);
    if (!parsed.success) {
      const fields: Record<string, string[]> = {};
      for (const i of parsed.error.issues)
        (fields[i.path.join(".")] ??= []).push(i.message);
      return setProblems(problemsOf(fields));
    }
    setProblems([]);
    update.mutate(
      { id: starter.id, body: parsed.data },
      {
        onSuccess: onDone,
        onError: (e) =>
          setProblems(
            isApiError(e) && e.fields
              ? [e.message, ...problemsOf(e.fields)]
              : [errorMessage(e)],
          ),
      },
    );
  };

  return (
    <div className="flex flex-col gap-4">
      {problems.length ? <FormError message={problems.join(" ")} /> : null}
      <TextField
        label="Starter name"
        value={draft.name}
        onChange={(e) => setDraft({ ...draft, name: e.target.value })}
      />
      <TextField
        label="What it is for"
        optional
        value={draft.description}
        onChange={(e) => setDraft({ ...draft, description: e.target.value })}
      />
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-sm font-medium">Tasks</legend>
        {draft.tasks.map((t, i) => (
          <div
            key={t.key}
            className="grid grid-cols-[1fr_6rem] items-end gap-2 sm:grid-cols-[1fr_7rem_auto]"
          >
            <TextField
              label={`Task ${i + 1} (${partyLabels[t.party]})`}
              value={t.name}
              onChange={(e) =>
                setDraft({
                  ...draft,
                  tasks: draft.tasks.map((x, j) =>
                    j === i ? { ...x, name: e.target.value } : x,
                  ),
                })
              }
            />
            <TextField
              label="Working days"
              type="number"
              step={0.5}
              min={0}
              inputClassName="font-mono"
              value={String(t.durationDays)}
              onChange={(e) =>
                setDraft({
                  ...draft,
                  tasks: draft.tasks.map((x, j) =>
                    j === i
                      ? { ...x, durationDays: e.target.valueAsNumber }
                      : x,
                  ),
                })
              }
            />
            <Button
              variant="quiet-danger"
              size="sm"
              disabled={draft.tasks.length === 1}
              aria-label={`Remove ${t.name || `task ${i + 1}`}`}
              onClick={() =>
                setDraft({
                  ...draft,
                  tasks: draft.tasks.filter((_, j) => j !== i),
                  // Its links go with it: a link must join two of the starter's tasks.
                  links: draft.links.filter(
                    (l) => l.from !== t.key && l.to !== t.key,
                  ),
                })
              }
            >
              Remove
            </Button>
          </div>
        ))}
      </fieldset>
      {draft.links.length ? (
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-1 text-sm font-medium">Waits for</legend>
          {draft.links.map((l, i) => (
            <div
              key={`${l.from}-${l.to}`}
              className="grid grid-cols-[1fr_6rem] items-end gap-2"
            >
              <p className="text-sm break-words">
                <span className="font-medium">{nameOf(l.to)}</span> waits for{" "}
                <span className="font-medium">{nameOf(l.from)}</span> (
                {linkKindLabels[l.kind]})
                {l.note ? (
                  <span className="block text-ink-soft">{l.note}</span>
                ) : null}
              </p>
              <TextField
                label={
                  l.lagUnit === "workingDays"
                    ? "Gap, working days"
                    : "Gap, hours"
                }
                type="number"
                step={l.lagUnit === "workingDays" ? 0.5 : 1}
                inputClassName="font-mono"
                value={String(l.lag)}
                onChange={(e) =>
                  setDraft({
                    ...draft,
                    links: draft.links.map((x, j) =>
                      j === i ? { ...x, lag: e.target.valueAsNumber } : x,
                    ),
                  })
                }
              />
            </div>
          ))}
        </fieldset>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button onClick={save} disabled={update.isPending}>
          {update.isPending ? "Saving…" : "Save starter"}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </div>
  );
}

/**
 * The workshop's starting programmes, for its owner: each one's tasks and links, renamed, edited
 * or deleted through the starter routes (the server checks an edit with the engine before saving).
 */
export function StartersEditor({ workshopId }: { workshopId: string }) {
  const starters = useStarters(workshopId);
  const remove = useDeleteStarter(workshopId);
  const [editing, setEditing] = useState<string | null>(null);
  const [confirming, setConfirming] = useState<string | null>(null);

  if (starters.isPending) return <LoadingState label="Loading starters…" />;
  if (starters.isError)
    return (
      <ErrorState error={starters.error} onRetry={() => starters.refetch()} />
    );
  const list = starters.data.starters;
  if (!list.length)
    return (
      <EmptyState title="No starters">
        New jobs start with an empty programme.
      </EmptyState>
    );
  return (
    <ul className="flex flex-col gap-3">
      {remove.isError ? (
        <li>
          <FormError message={errorMessage(remove.error)} />
        </li>
      ) : null}
      {list.map((s) => {
        const days = s.tasks.reduce((n, t) => n + t.durationDays, 0);
        return (
          <li key={s.id} className="rounded border border-rule px-3 py-3">
            {editing === s.id ? (
              <StarterForm
                workshopId={workshopId}
                starter={s}
                onDone={() => setEditing(null)}
              />
            ) : (
              <div className="flex flex-wrap items-start justify-between gap-2">
                <div className="min-w-0">
                  <p className="font-semibold break-words">{s.name}</p>
                  <p className="text-sm text-ink-soft">
                    {s.tasks.length} {s.tasks.length === 1 ? "task" : "tasks"},{" "}
                    {formatDays(days)} of work
                    {s.description ? ` · ${s.description}` : ""}
                  </p>
                </div>
                {confirming === s.id ? (
                  <div className="flex flex-wrap items-center gap-2">
                    <span className="text-sm">Delete {s.name}?</span>
                    <Button
                      variant="danger"
                      size="sm"
                      disabled={remove.isPending}
                      onClick={() =>
                        remove.mutate(s.id, {
                          onSuccess: () => setConfirming(null),
                        })
                      }
                    >
                      Delete starter
                    </Button>
                    <Button
                      variant="secondary"
                      size="sm"
                      onClick={() => setConfirming(null)}
                    >
                      Keep it
                    </Button>
                  </div>
                ) : (
                  <div className="flex flex-wrap gap-2">
                    <Button
                      variant="secondary"
                      size="sm"
                      aria-label={`Edit ${s.name}`}
                      onClick={() => setEditing(s.id)}
                    >
                      Edit
                    </Button>
                    <Button
                      variant="quiet-danger"
                      size="sm"
                      aria-label={`Delete ${s.name}`}
                      onClick={() => setConfirming(s.id)}
                    >
                      Delete
                    </Button>
                  </div>
                )}
              </div>
            )}
          </li>
        );
      })}
    </ul>
  );
}
