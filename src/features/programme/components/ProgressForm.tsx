import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { isoDateSchema, type ProgrammeTask } from "../../../../shared/schemas";
import { Button, FormError, TextField } from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import type { ProgressInput } from "../api/record-progress";
import { dateOf } from "../model";

const progressFormSchema = z.object({
  date: isoDateSchema,
  part: z.enum(["first", "second"]),
});
type Values = z.infer<typeof progressFormSchema>;

interface ProgressFormProps {
  version: number;
  task: ProgrammeTask;
  mode: "start" | "done";
  /** The planned start, for a task marked done that was never marked started. */
  plannedStart: string;
  today: string;
  onSave: (body: ProgressInput) => Promise<unknown>;
  onDone: () => void;
}

/**
 * Mark a task started (that morning, or from the afternoon) or done (by midday, or at the end
 * of the day): the API's date or date-at-12:00.
 */
export function ProgressForm({
  version,
  task,
  mode,
  plannedStart,
  today,
  onSave,
  onDone,
}: ProgressFormProps) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<Values>({
    resolver: zodResolver(progressFormSchema),
    defaultValues: { date: today, part: mode === "start" ? "first" : "second" },
  });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async ({ date, part }) => {
    setFormError(null);
    let body: ProgressInput;
    if (mode === "start") {
      body = {
        version,
        actualStart: part === "second" ? `${date}T12:00` : date,
        actualFinish: null,
      };
    } else {
      const start =
        task.actualStart ??
        (dateOf(plannedStart) <= date ? dateOf(plannedStart) : date);
      body = {
        version,
        actualStart: start,
        actualFinish: part === "first" ? `${date}T12:00` : date,
      };
    }
    try {
      await onSave(body);
      onDone();
    } catch (error) {
      const message = applyServerErrors(error, form.setError, []);
      setFormError(message);
    }
  });

  const options =
    mode === "start"
      ? [
          ["first", "In the morning"],
          ["second", "From the afternoon"],
        ]
      : [
          ["first", "By midday"],
          ["second", "By the end of the day"],
        ];
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={
        mode === "start"
          ? `Mark ${task.name} started`
          : `Mark ${task.name} done`
      }
      className="flex flex-col gap-3 rounded border border-rule bg-paper p-4"
    >
      <FormError message={formError} />
      <div className="flex flex-wrap items-end gap-4">
        <TextField
          label={mode === "start" ? "Started on" : "Done on"}
          type="date"
          error={errors.date?.message}
          inputClassName="font-mono"
          {...form.register("date")}
        />
        <fieldset className="flex flex-wrap gap-3">
          <legend className="sr-only">Which part of the day</legend>
          {options.map(([value, label]) => (
            <label
              key={value}
              className="flex min-h-10 items-center gap-2 text-sm"
            >
              <input
                type="radio"
                value={value}
                className="accent-accent"
                {...form.register("part")}
              />
              {label}
            </label>
          ))}
        </fieldset>
      </div>
      {mode === "done" && !task.actualStart ? (
        <p className="text-sm text-ink-soft">
          It is marked started on its planned start day too.
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={isSubmitting}>
          {mode === "start" ? "Mark started" : "Mark done"}
        </Button>
        <Button variant="secondary" onClick={onDone} disabled={isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
