import { zodResolver } from "@hookform/resolvers/zod";
import { useId, useState, type ReactNode } from "react";
import { Controller, useForm, useWatch } from "react-hook-form";
import { z } from "zod";
import {
  createJobBodySchema,
  idSchema,
  jobStatuses,
  nationChoices,
  type HolidayRegion,
  type CustomerResponse,
  type JobDetail,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  Select,
  TextArea,
  TextField,
  WeekdayPicker,
} from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { formatDate } from "../../../lib/format";
import { holidayRegionLabels, jobStatusLabels } from "../../../lib/labels";
import { useCreateJob } from "../api/create-job";
import { useStarters } from "../api/list-starters";

// The shared body schema, with a plain message for the unchosen customer (an empty
// select) instead of the generic "Must be a valid id".
const newJobFormSchema = createJobBodySchema.extend({
  customerId: z
    .string()
    .min(1, "Choose a customer, or add a new one")
    .pipe(idSchema),
});

type Input = z.input<typeof newJobFormSchema>;
type Output = z.output<typeof newJobFormSchema>;

const FIELDS = [
  "title",
  "customerId",
  "siteAddress",
  "postcode",
  "area",
  "holidayRegion",
  "status",
  "handoverDate",
  "siteWeekdays",
  "accessNotes",
  "starterId",
] as const;

interface NewJobFormProps {
  workshopId: string;
  customers: CustomerResponse[] | undefined;
  customersLoading: boolean;
  customersError: string | null;
  /** Renders a form that adds a customer and reports the new customer's id. */
  renderAddCustomer: (
    onAdded: (customerId: string) => void,
    onCancel: () => void,
  ) => ReactNode;
  onCreated: (job: JobDetail) => void;
  onCancel: () => void;
  /** The workshop's settings a new job starts from (its nation and usual site days). */
  defaults?: { holidayRegion: HolidayRegion | null; siteWeekdays: number[] };
}

export function NewJobForm({
  workshopId,
  customers,
  customersLoading,
  customersError,
  renderAddCustomer,
  onCreated,
  onCancel,
  defaults,
}: NewJobFormProps) {
  const createJob = useCreateJob(workshopId);
  const starters = useStarters(workshopId);
  const [addingCustomer, setAddingCustomer] = useState(false);
  const formId = useId();
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(newJobFormSchema),
    defaultValues: {
      title: "",
      customerId: "",
      siteAddress: "",
      postcode: "",
      area: "",
      // GB-WLS has England's bank holidays: the one "England & Wales" choice (shared nationLabels).
      holidayRegion:
        nationChoices.find((r) => r === defaults?.holidayRegion) ?? "GB-ENG",
      status: "survey",
      handoverDate: null,
      siteWeekdays: defaults?.siteWeekdays ?? [1, 2, 3, 4, 5],
      accessNotes: "",
    },
  });
  const { errors } = form.formState;
  const handover = useWatch({ control: form.control, name: "handoverDate" });
  const formError = createJob.isError
    ? applyServerErrors(createJob.error, form.setError, FIELDS)
    : null;

  const onSubmit = form.handleSubmit((body) =>
    createJob.mutate(body, { onSuccess: onCreated }),
  );

  return (
    <div className="flex flex-col gap-4">
      <FormError message={formError} />
      <TextField
        label="Title"
        placeholder="e.g. Alcove cabinets, front room"
        error={errors.title?.message}
        form={formId}
        autoFocus
        {...form.register("title")}
      />
      {/* The customer picker sits outside the job form (linked by the form attribute) so
          the add-customer form can open beside it without nesting one form in another. */}
      <div className="flex flex-col gap-1">
        <Controller
          control={form.control}
          name="customerId"
          render={({ field }) => (
            <Select
              label="Customer"
              error={errors.customerId?.message ?? customersError ?? undefined}
              disabled={customersLoading}
              hint={customersLoading ? "Loading customers…" : undefined}
              form={formId}
              {...field}
            >
              <option value="">Choose a customer</option>
              {(customers ?? []).map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name} ({c.email})
                </option>
              ))}
            </Select>
          )}
        />
        {!addingCustomer ? (
          <Button
            variant="quiet"
            size="sm"
            className="self-start"
            onClick={() => setAddingCustomer(true)}
          >
            Add a new customer
          </Button>
        ) : null}
      </div>
      {addingCustomer ? (
        <div className="rounded border border-rule bg-paper p-4">
          {renderAddCustomer(
            (customerId) => {
              form.setValue("customerId", customerId, { shouldValidate: true });
              setAddingCustomer(false);
            },
            () => setAddingCustomer(false),
          )}
        </div>
      ) : null}
      <form
        id={formId}
        onSubmit={onSubmit}
        noValidate
        className="grid gap-4 md:grid-cols-2"
        aria-label="New job"
      >
        <TextArea
          label="Site address"
          rows={2}
          hint="Shown to trades only once their booking is confirmed."
          error={errors.siteAddress?.message}
          className="md:col-span-2"
          {...form.register("siteAddress")}
        />
        <TextField
          label="Postcode"
          autoCapitalize="characters"
          error={errors.postcode?.message}
          {...form.register("postcode")}
        />
        <TextField
          label="Area"
          hint="Town or district, shown to trades before they confirm."
          error={errors.area?.message}
          {...form.register("area")}
        />
        <Select
          label="Bank holidays"
          hint="Which nation's bank holidays close the site."
          error={errors.holidayRegion?.message}
          {...form.register("holidayRegion")}
        >
          {nationChoices.map((r) => (
            <option key={r} value={r}>
              {holidayRegionLabels[r]}
            </option>
          ))}
        </Select>
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
          hint={handover ? formatDate(handover) : undefined}
          error={errors.handoverDate?.message}
          inputClassName="font-mono"
          {...form.register("handoverDate", {
            setValueAs: (v: unknown) => (v === "" || v == null ? null : v),
          })}
        />
        <Controller
          control={form.control}
          name="siteWeekdays"
          render={({ field }) => (
            <WeekdayPicker
              legend="Days the site is open to trades"
              value={field.value ?? []}
              onChange={field.onChange}
              error={errors.siteWeekdays?.message}
            />
          )}
        />
        <Select
          label="Start from"
          hint={
            starters.isError
              ? "Starting programmes could not be loaded; the job starts empty."
              : "A starting programme brings its tasks and links, dated from the workshop's first free start."
          }
          disabled={starters.isPending}
          error={errors.starterId?.message}
          {...form.register("starterId", {
            setValueAs: (v: unknown) => (v === "" || v == null ? undefined : v),
          })}
        >
          <option value="">An empty programme</option>
          {(starters.data?.starters ?? []).map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </Select>
        <TextArea
          label="Access notes"
          optional
          hint="Parking, keys, alarm, pets. Confirmed trades see these."
          error={errors.accessNotes?.message}
          className="md:col-span-2"
          {...form.register("accessNotes")}
        />
        <div className="flex flex-wrap gap-2 md:col-span-2">
          <Button type="submit" busy={createJob.isPending}>
            Create job
          </Button>
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        </div>
      </form>
    </div>
  );
}
