import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { Controller, useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import {
  createTaskBodySchema,
  hazardSchema,
  partySchema,
  updateTaskBodySchema,
  type ProgrammeTask,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  Select,
  TextArea,
  TextField,
  cx,
} from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { formatDate } from "../../../lib/format";
import { partyLabels } from "../../../lib/labels";

type Input = z.input<typeof createTaskBodySchema>;
type Output = z.output<typeof createTaskBodySchema>;
export type TaskUpdate = z.output<typeof updateTaskBodySchema>;

const FIELDS = [
  "name",
  "party",
  "durationDays",
  "notEarlierThan",
  "customerNote",
  "internalNote",
  "hazards",
] as const;

export const hazardLabels: Record<z.infer<typeof hazardSchema>, string> = {
  electrical: "Electrical",
  height: "Work at height",
  "tall-unit": "Tall units fixed to walls",
};

interface TaskFormProps {
  version: number;
  /** The task being edited; a new task when absent. */
  task?: ProgrammeTask;
  onCreate?: (body: Output) => Promise<unknown>;
  /** Only the fields that changed, so a partial update touches nothing else. */
  onUpdate?: (body: TaskUpdate) => Promise<unknown>;
  onDone: () => void;
}

/** Add or edit a task, checked with the shared schema the server uses. */
export function TaskForm({
  version,
  task,
  onCreate,
  onUpdate,
  onDone,
}: TaskFormProps) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(createTaskBodySchema),
    defaultValues: {
      version,
      name: task?.name ?? "",
      party: task?.party ?? "workshop",
      durationDays: task?.durationDays ?? 1,
      notEarlierThan: task?.notEarlierThan ?? null,
      customerNote: task?.customerNote ?? "",
      internalNote: task?.internalNote ?? "",
      hazards: task?.hazards ?? [],
    },
  });
  const { errors, isSubmitting, dirtyFields } = form.formState;
  const notEarlierThan = useWatch({
    control: form.control,
    name: "notEarlierThan",
  });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      if (task && onUpdate) {
        const body: TaskUpdate = { version };
        for (const f of FIELDS) {
          if (dirtyFields[f]) Object.assign(body, { [f]: values[f] });
        }
        await onUpdate(updateTaskBodySchema.parse(body));
      } else if (onCreate) {
        await onCreate({ ...values, version });
      }
      onDone();
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, FIELDS));
    }
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={task ? `Edit ${task.name}` : "New task"}
      className="grid gap-4 rounded border border-rule bg-paper p-4 md:grid-cols-2"
    >
      <FormError message={formError} className="md:col-span-2" />
      <TextField
        label="Task name"
        placeholder="e.g. Fix carcasses & scribes"
        error={errors.name?.message}
        className="md:col-span-2"
        autoFocus
        {...form.register("name")}
      />
      <Select
        label="Who does it"
        error={errors.party?.message}
        {...form.register("party")}
      >
        {partySchema.options.map((p) => (
          <option key={p} value={p}>
            {partyLabels[p]}
          </option>
        ))}
      </Select>
      <TextField
        label="Duration (working days)"
        type="number"
        inputMode="decimal"
        step={0.5}
        min={0}
        hint="Half days are one morning or afternoon; 0 is a milestone."
        error={errors.durationDays?.message}
        inputClassName="font-mono"
        {...form.register("durationDays", { valueAsNumber: true })}
      />
      <TextField
        label="Not earlier than"
        type="date"
        optional
        hint={
          notEarlierThan
            ? `${formatDate(notEarlierThan)} — e.g. a delivery date`
            : "A delivery date, or drying agreed with the customer."
        }
        error={errors.notEarlierThan?.message}
        inputClassName="font-mono"
        {...form.register("notEarlierThan", {
          setValueAs: (v: unknown) => (v === "" || v == null ? null : v),
        })}
      />
      <Controller
        control={form.control}
        name="hazards"
        render={({ field }) => (
          <fieldset className="flex flex-col gap-1">
            <legend className="mb-1 text-sm font-medium">
              Hazards{" "}
              <span className="font-normal text-ink-soft">(optional)</span>
            </legend>
            <div className="flex flex-wrap gap-1.5">
              {hazardSchema.options.map((h) => {
                const value = field.value ?? [];
                const checked = value.includes(h);
                return (
                  <label
                    key={h}
                    className={cx(
                      "flex min-h-9 items-center gap-1.5 rounded border px-2.5 text-sm",
                      checked
                        ? "border-wait bg-wait-wash"
                        : "border-rule-strong bg-card",
                    )}
                  >
                    <input
                      type="checkbox"
                      className="accent-accent"
                      checked={checked}
                      onChange={(e) =>
                        field.onChange(
                          e.target.checked
                            ? [...value, h]
                            : value.filter((x) => x !== h),
                        )
                      }
                    />
                    {hazardLabels[h]}
                  </label>
                );
              })}
            </div>
            {errors.hazards?.message ? (
              <p className="text-sm font-medium text-risk">
                {errors.hazards.message}
              </p>
            ) : null}
          </fieldset>
        )}
      />
      <TextArea
        label="What to prepare"
        optional
        rows={2}
        hint="Shown to the customer, e.g. clear the alcove."
        error={errors.customerNote?.message}
        {...form.register("customerNote")}
      />
      <TextArea
        label="Internal note"
        optional
        rows={2}
        hint="Workshop only."
        error={errors.internalNote?.message}
        {...form.register("internalNote")}
      />
      <div className="flex flex-wrap gap-2 md:col-span-2">
        <Button type="submit" busy={isSubmitting}>
          {task ? "Save task" : "Add task"}
        </Button>
        <Button variant="secondary" onClick={onDone} disabled={isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
