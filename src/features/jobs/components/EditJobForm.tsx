import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import {
  jobStatuses,
  updateJobBodySchema,
  type JobDetail,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  Select,
  TextArea,
  TextField,
} from "../../../components/ui";
import { isApiError } from "../../../lib/api-client";
import { applyServerErrors } from "../../../lib/form-errors";
import { formatDate } from "../../../lib/format";
import { jobStatusLabels } from "../../../lib/labels";
import { useUpdateJob } from "../api/update-job";

type Input = z.input<typeof updateJobBodySchema>;
type Output = z.output<typeof updateJobBodySchema>;

interface EditJobFormProps {
  job: JobDetail;
  onSaved: () => void;
  onCancel: () => void;
}

/** Edits the job's own fields; the version makes a save fail if someone else saved first. */
export function EditJobForm({ job, onSaved, onCancel }: EditJobFormProps) {
  const update = useUpdateJob(job.id);
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(updateJobBodySchema),
    defaultValues: {
      version: job.version,
      title: job.title,
      area: job.area,
      status: job.status,
      handoverDate: job.handoverDate,
      accessNotes: job.accessNotes ?? "",
    },
  });
  const { errors } = form.formState;
  const handover = useWatch({ control: form.control, name: "handoverDate" });

  // After a conflict the page reloads the job; take its new version so that saving
  // again is a deliberate choice to put these edits over the other person's.
  useEffect(() => {
    form.setValue("version", job.version);
  }, [form, job.version]);

  let formError: string | null = null;
  if (update.isError) {
    formError =
      isApiError(update.error) && update.error.code === "version-conflict"
        ? `${update.error.message} The page now shows their version; check it, then save again to keep your changes.`
        : applyServerErrors(update.error, form.setError, [
            "title",
            "area",
            "status",
            "handoverDate",
            "accessNotes",
          ]);
  }

  const onSubmit = form.handleSubmit((body) =>
    update.mutate(body, { onSuccess: onSaved }),
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Edit job"
      className="grid gap-4 md:grid-cols-2"
    >
      <FormError className="md:col-span-2" message={formError} />
      <TextField
        label="Title"
        error={errors.title?.message}
        className="md:col-span-2"
        {...form.register("title")}
      />
      <TextField
        label="Area"
        error={errors.area?.message}
        {...form.register("area")}
      />
      <Select
        label="Status"
        error={errors.status?.message}
        {...form.register("status")}
      >
        {jobStatuses.map((s) => (
          <option key={s} value={s}>
            {jobStatusLabels[s]}
          </option>
        ))}
      </Select>
      <TextField
        label="Agreed handover"
        type="date"
        optional
        inputClassName="font-mono"
        hint={handover ? formatDate(handover) : undefined}
        error={errors.handoverDate?.message}
        {...form.register("handoverDate", {
          setValueAs: (v: unknown) => (v === "" || v == null ? null : v),
        })}
      />
      <TextArea
        label="Access notes"
        optional
        hint="Parking, keys, alarm, pets. Confirmed trades see these."
        error={errors.accessNotes?.message}
        className="md:col-span-2"
        {...form.register("accessNotes")}
      />
      <div className="flex flex-wrap gap-2 md:col-span-2">
        <Button type="submit" busy={update.isPending}>
          Save changes
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
