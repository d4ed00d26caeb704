import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm, useWatch, type UseFormRegisterReturn } from "react-hook-form";
import type { z } from "zod";
import {
  createLinkBodySchema,
  linkKindSchema,
  lagUnitSchema,
  updateLinkBodySchema,
  type ProgrammeTask,
} from "../../../../shared/schemas";
import { Button, FormError, Select, TextField } from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import {
  lagText,
  lagUnitWords,
  linkKindWords,
  type ProgrammeLink,
} from "../model";

type CreateInput = z.input<typeof createLinkBodySchema>;
type CreateOutput = z.output<typeof createLinkBodySchema>;
type UpdateInput = z.input<typeof updateLinkBodySchema>;
export type LinkUpdate = z.output<typeof updateLinkBodySchema>;

const CREATE_FIELDS = [
  "fromTaskId",
  "toTaskId",
  "kind",
  "lag",
  "lagUnit",
] as const;
const UPDATE_FIELDS = ["kind", "lag", "lagUnit"] as const;

function Sentence({
  waiting,
  waitsFor,
  kind,
  lag,
  lagUnit,
}: {
  waiting?: string;
  waitsFor?: string;
  kind: "FS" | "SS" | "FF";
  lag: number;
  lagUnit: "workingDays" | "elapsedHours";
}) {
  if (!waiting || !waitsFor) return null;
  const lagWords = Number.isFinite(lag) ? lagText(lag, lagUnit) : "";
  const verb = kind === "FF" ? "finishes" : "starts";
  const rest = {
    FS: `${waitsFor} finishes`,
    SS: `${waitsFor} starts`,
    FF: `${waitsFor} finishes`,
  }[kind];
  return (
    <p className="text-sm text-ink-soft md:col-span-2" aria-live="polite">
      <span className="text-ink">{waiting}</span> {verb}{" "}
      {lagWords ? lagWords.replace(/ — drying$/, "") : "after"} {rest}
      {lagUnit === "elapsedHours" && lag > 0 ? " (drying, in real hours)" : ""}.
    </p>
  );
}

function KindAndLag({
  kind,
  lag,
  lagUnit,
  errors,
}: {
  kind: UseFormRegisterReturn;
  lag: UseFormRegisterReturn;
  lagUnit: UseFormRegisterReturn;
  errors: Partial<Record<"kind" | "lag" | "lagUnit", { message?: string }>>;
}) {
  return (
    <>
      <Select label="When it can go" error={errors.kind?.message} {...kind}>
        {linkKindSchema.options.map((k) => (
          <option key={k} value={k}>
            {linkKindWords[k]}
          </option>
        ))}
      </Select>
      <div className="grid grid-cols-[1fr_1.4fr] gap-2">
        <TextField
          label="Lag"
          type="number"
          inputMode="decimal"
          step={0.5}
          hint="0 for straight after."
          error={errors.lag?.message}
          inputClassName="font-mono"
          {...lag}
        />
        <Select label="Lag in" error={errors.lagUnit?.message} {...lagUnit}>
          {lagUnitSchema.options.map((u) => (
            <option key={u} value={u}>
              {lagUnitWords[u]}
            </option>
          ))}
        </Select>
      </div>
    </>
  );
}

interface NewLinkFormProps {
  version: number;
  tasks: ProgrammeTask[];
  /** Preselect the waiting task (from a task's own "Add what it waits for"). */
  waitingTaskId?: string;
  onCreate: (body: CreateOutput) => Promise<unknown>;
  onDone: () => void;
}

/** Add a "waits for" link, checked with the shared schema (a loop is the server's 422). */
export function NewLinkForm({
  version,
  tasks,
  waitingTaskId,
  onCreate,
  onDone,
}: NewLinkFormProps) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<CreateInput, unknown, CreateOutput>({
    resolver: zodResolver(createLinkBodySchema),
    defaultValues: {
      version,
      toTaskId: waitingTaskId ?? "",
      fromTaskId: "",
      kind: "FS",
      lag: 0,
      lagUnit: "workingDays",
    },
  });
  const { errors, isSubmitting } = form.formState;
  const [to, from, kind, lag, lagUnit] = useWatch({
    control: form.control,
    name: ["toTaskId", "fromTaskId", "kind", "lag", "lagUnit"],
  });
  const nameOf = (id: string) => tasks.find((t) => t.id === id)?.name;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await onCreate({ ...values, version });
      onDone();
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, CREATE_FIELDS));
    }
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="New link"
      className="grid gap-4 rounded border border-rule bg-paper p-4 md:grid-cols-2"
    >
      <FormError message={formError} className="md:col-span-2" />
      <Select
        label="Waiting task"
        error={errors.toTaskId?.message}
        {...form.register("toTaskId")}
      >
        <option value="">Choose a task</option>
        {tasks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </Select>
      <Select
        label="Waits for"
        error={errors.fromTaskId?.message}
        {...form.register("fromTaskId")}
      >
        <option value="">Choose a task</option>
        {tasks
          .filter((t) => t.id !== to)
          .map((t) => (
            <option key={t.id} value={t.id}>
              {t.name}
            </option>
          ))}
      </Select>
      <KindAndLag
        kind={form.register("kind")}
        lag={form.register("lag", { valueAsNumber: true })}
        lagUnit={form.register("lagUnit")}
        errors={errors}
      />
      <Sentence
        waiting={nameOf(to ?? "")}
        waitsFor={nameOf(from ?? "")}
        kind={kind ?? "FS"}
        lag={Number(lag ?? 0)}
        lagUnit={lagUnit ?? "workingDays"}
      />
      <div className="flex flex-wrap gap-2 md:col-span-2">
        <Button type="submit" busy={isSubmitting}>
          Add link
        </Button>
        <Button variant="secondary" onClick={onDone} disabled={isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

interface EditLinkFormProps {
  version: number;
  link: ProgrammeLink;
  waiting: string;
  waitsFor: string;
  onUpdate: (body: LinkUpdate) => Promise<unknown>;
  onDone: () => void;
}

/** Change a link's kind or lag. */
export function EditLinkForm({
  version,
  link,
  waiting,
  waitsFor,
  onUpdate,
  onDone,
}: EditLinkFormProps) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<UpdateInput, unknown, LinkUpdate>({
    resolver: zodResolver(updateLinkBodySchema),
    defaultValues: {
      version,
      kind: link.kind,
      lag: link.lag,
      lagUnit: link.lagUnit,
    },
  });
  const { errors, isSubmitting } = form.formState;
  const [kind, lag, lagUnit] = useWatch({
    control: form.control,
    name: ["kind", "lag", "lagUnit"],
  });
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await onUpdate({ ...values, version });
      onDone();
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, UPDATE_FIELDS));
    }
  });
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={`Edit link: ${waiting} waits for ${waitsFor}`}
      className="grid gap-4 rounded border border-rule bg-paper p-4 md:grid-cols-2"
    >
      <FormError message={formError} className="md:col-span-2" />
      <p className="text-sm md:col-span-2">
        <span className="font-medium">{waiting}</span> waits for{" "}
        <span className="font-medium">{waitsFor}</span>
      </p>
      <KindAndLag
        kind={form.register("kind")}
        lag={form.register("lag", { valueAsNumber: true })}
        lagUnit={form.register("lagUnit")}
        errors={errors}
      />
      <Sentence
        waiting={waiting}
        waitsFor={waitsFor}
        kind={kind ?? "FS"}
        lag={Number(lag ?? 0)}
        lagUnit={lagUnit ?? "workingDays"}
      />
      <div className="flex flex-wrap gap-2 md:col-span-2">
        <Button type="submit" busy={isSubmitting}>
          Save link
        </Button>
        <Button variant="secondary" onClick={onDone} disabled={isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
