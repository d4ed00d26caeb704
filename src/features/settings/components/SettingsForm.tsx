import { zodResolver } from "@hookform/resolvers/zod";
import { useState, type ReactNode } from "react";
import { Controller, useForm } from "react-hook-form";
import {
  arrivalWindows,
  nationChoices,
  nationLabels,
  REMINDER_DAYS_MAX,
  workshopSettingsSchema,
  type SettingsPreview,
  type UpdateWorkshopBody,
  type WorkshopResponse,
  type WorkshopSettings,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  Select,
  TextField,
  WeekdayPicker,
} from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { arrivalChoiceLabels } from "../../../lib/labels";
import { usePreviewSettings } from "../api/preview-settings";
import { useUpdateWorkshop } from "../api/update-workshop";
import { KnockOn } from "./KnockOn";

/** The groups of settings, shown together on the settings screen and one by one in the set-up. */
export type SettingsGroup = "workshop" | "nation" | "days" | "arrivals";

const groupFields: Record<SettingsGroup, (keyof WorkshopSettings)[]> = {
  workshop: ["name", "town"],
  nation: ["holidayRegion", "timeZone"],
  days: ["workingWeekdays", "dayStart", "dayEnd", "siteWeekdays"],
  arrivals: ["arrivalWindows", "reminderDays"],
};
const FIELDS = Object.values(groupFields).flat();

/** The settings the programme engine reads: a change to one is shown as its knock-on first. */
const REPLANNING: (keyof WorkshopSettings)[] = [
  "holidayRegion",
  "timeZone",
  "workingWeekdays",
  "dayStart",
  "dayEnd",
];

function settingsOf(w: WorkshopResponse): WorkshopSettings {
  return {
    name: w.name,
    town: w.town,
    holidayRegion: w.holidayRegion,
    timeZone: w.timeZone,
    workingWeekdays: w.workingWeekdays,
    dayStart: w.dayStart,
    dayEnd: w.dayEnd,
    siteWeekdays: w.siteWeekdays,
    arrivalWindows: w.arrivalWindows,
    reminderDays: w.reminderDays,
  };
}

const same = (a: unknown, b: unknown) =>
  JSON.stringify(a) === JSON.stringify(b);

// The runtime's own list of IANA zones (ECMA-402), with the workshop's current one kept.
function timeZones(current: string): string[] {
  const list =
    typeof Intl.supportedValuesOf === "function"
      ? Intl.supportedValuesOf("timeZone")
      : ["Europe/London"];
  return list.includes(current) ? list : [current, ...list];
}

function reminderWords(n: number): string {
  if (n === 0) return "No reminder";
  return n === 1 ? "The working day before" : `${n} working days before`;
}

interface SettingsFormProps {
  workshop: WorkshopResponse;
  groups: SettingsGroup[];
  submitLabel: string;
  /** Sent with the changes, e.g. where the set-up stands. */
  extraBody?: Pick<UpdateWorkshopBody, "setupStep" | "setupDone">;
  onSaved?: (w: WorkshopResponse, replanned: SettingsPreview | null) => void;
  /** More buttons beside the submit one (e.g. "Skip this step"). */
  actions?: ReactNode;
}

/**
 * The workshop's settings, in the groups asked for, checked with the one shared schema. A change
 * to the nation, time zone, working days or hours first asks the server what it does to the open
 * jobs (the engine's preview) and shows it; the change is saved only once confirmed.
 */
export function SettingsForm({
  workshop,
  groups,
  submitLabel,
  extraBody,
  onSaved,
  actions,
}: SettingsFormProps) {
  const update = useUpdateWorkshop(workshop.id);
  const preview = usePreviewSettings(workshop.id);
  const [pending, setPending] = useState<{
    body: UpdateWorkshopBody;
    knockOn: SettingsPreview;
  } | null>(null);
  const initial = settingsOf(workshop);
  const form = useForm<WorkshopSettings>({
    resolver: zodResolver(workshopSettingsSchema),
    defaultValues: initial,
  });
  const { errors } = form.formState;
  const shown = new Set(groups.flatMap((g) => groupFields[g]));
  const failed = update.error ?? preview.error;
  const formError = failed
    ? applyServerErrors(failed, form.setError, FIELDS)
    : null;

  const save = (body: UpdateWorkshopBody, knockOn: SettingsPreview | null) =>
    update.mutate(body, {
      onSuccess: (w) => {
        setPending(null);
        form.reset(settingsOf(w));
        onSaved?.(w, knockOn);
      },
    });

  const onSubmit = form.handleSubmit(async (values) => {
    update.reset();
    preview.reset();
    const changes: Partial<WorkshopSettings> = {};
    for (const key of FIELDS)
      if (shown.has(key) && !same(values[key], initial[key]))
        Object.assign(changes, { [key]: values[key] });
    const body: UpdateWorkshopBody = { ...changes, ...extraBody };
    if (REPLANNING.some((k) => k in changes)) {
      const knockOn = await preview.mutateAsync(body).catch(() => null);
      if (!knockOn) return;
      // Nothing open moves: no question to ask.
      if (knockOn.jobs.length > 0) return setPending({ body, knockOn });
      return save(body, knockOn);
    }
    save(body, null);
  });

  if (pending)
    return (
      <div className="flex flex-col gap-4">
        <FormError message={formError} />
        <KnockOn preview={pending.knockOn} />
        <div className="flex flex-wrap gap-2">
          <Button
            onClick={() => save(pending.body, pending.knockOn)}
            disabled={update.isPending}
          >
            {update.isPending ? "Saving…" : "Save and re-plan these jobs"}
          </Button>
          <Button variant="secondary" onClick={() => setPending(null)}>
            Go back to the settings
          </Button>
        </div>
      </div>
    );

  const busy = update.isPending || preview.isPending;
  return (
    <form className="flex flex-col gap-5" onSubmit={onSubmit} noValidate>
      <FormError message={formError} />
      {shown.has("name") ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Workshop name"
            error={errors.name?.message}
            {...form.register("name")}
          />
          <TextField
            label="Town"
            optional
            error={errors.town?.message}
            {...form.register("town")}
          />
        </div>
      ) : null}
      {shown.has("holidayRegion") ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <Controller
            control={form.control}
            name="holidayRegion"
            render={({ field }) => (
              <Select
                label="Nation"
                hint="Its bank holidays close the workshop and, on new jobs, the site."
                error={errors.holidayRegion?.message}
                name={field.name}
                ref={field.ref}
                onBlur={field.onBlur}
                value={field.value ?? ""}
                onChange={(e) => field.onChange(e.target.value || null)}
              >
                {field.value === null ? (
                  <option value="">Choose a nation</option>
                ) : null}
                {nationChoices.map((r) => (
                  // A workshop stored as GB-WLS keeps it: the same bank holidays as GB-ENG.
                  <option
                    key={r}
                    value={
                      r === "GB-ENG" && field.value === "GB-WLS" ? "GB-WLS" : r
                    }
                  >
                    {nationLabels[r]}
                  </option>
                ))}
              </Select>
            )}
          />
          <Select
            label="Time zone"
            hint="Days and times on the programme are the workshop's local ones."
            error={errors.timeZone?.message}
            {...form.register("timeZone")}
          >
            {timeZones(workshop.timeZone).map((z) => (
              <option key={z} value={z}>
                {z.replaceAll("_", " ")}
              </option>
            ))}
          </Select>
        </div>
      ) : null}
      {shown.has("workingWeekdays") ? (
        <>
          <Controller
            control={form.control}
            name="workingWeekdays"
            render={({ field }) => (
              <WeekdayPicker
                legend="Days the workshop works"
                value={field.value}
                onChange={field.onChange}
                error={errors.workingWeekdays?.message}
              />
            )}
          />
          <div className="grid grid-cols-2 gap-4 sm:max-w-sm">
            <TextField
              label="Day starts"
              // Text, not type="time": the browser's time control shows 12-hour times in some
              // locales, and Sitecue writes the 24-hour clock.
              inputMode="numeric"
              placeholder="08:00"
              inputClassName="font-mono"
              error={errors.dayStart?.message}
              {...form.register("dayStart")}
            />
            <TextField
              label="Day ends"
              // Text, not type="time": the browser's time control shows 12-hour times in some
              // locales, and Sitecue writes the 24-hour clock.
              inputMode="numeric"
              placeholder="08:00"
              inputClassName="font-mono"
              error={errors.dayEnd?.message}
              {...form.register("dayEnd")}
            />
          </div>
          <Controller
            control={form.control}
            name="siteWeekdays"
            render={({ field }) => (
              <WeekdayPicker
                legend="Usual site days (new jobs start with these)"
                value={field.value}
                onChange={field.onChange}
                error={errors.siteWeekdays?.message}
              />
            )}
          />
        </>
      ) : null}
      {shown.has("arrivalWindows") ? (
        <>
          <Controller
            control={form.control}
            name="arrivalWindows"
            render={({ field }) => (
              <fieldset className="flex flex-col gap-1">
                <legend className="mb-1 text-sm font-medium">
                  Arrival times you offer trades
                </legend>
                <div className="flex flex-wrap gap-x-4 gap-y-1">
                  {arrivalWindows.map((a) => (
                    <label
                      key={a}
                      className="flex min-h-10 items-center gap-2 text-sm"
                    >
                      <input
                        type="checkbox"
                        className="accent-accent"
                        checked={field.value.includes(a)}
                        onChange={(e) =>
                          field.onChange(
                            e.target.checked
                              ? arrivalWindows.filter(
                                  (x) => x === a || field.value.includes(x),
                                )
                              : field.value.filter((x) => x !== a),
                          )
                        }
                      />
                      {arrivalChoiceLabels[a]}
                    </label>
                  ))}
                </div>
                {errors.arrivalWindows?.message ? (
                  <p className="text-sm font-medium text-risk">
                    {errors.arrivalWindows.message}
                  </p>
                ) : null}
              </fieldset>
            )}
          />
          <Select
            label="Reminder to the trade"
            hint="An e-mail before a confirmed visit, counted in the site's working days."
            className="sm:max-w-sm"
            error={errors.reminderDays?.message}
            {...form.register("reminderDays", { valueAsNumber: true })}
          >
            {Array.from({ length: REMINDER_DAYS_MAX + 1 }, (_, n) => (
              <option key={n} value={n}>
                {reminderWords(n)}
              </option>
            ))}
          </Select>
        </>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={busy}>
          {preview.isPending
            ? "Working out what moves…"
            : update.isPending
              ? "Saving…"
              : submitLabel}
        </Button>
        {actions}
      </div>
    </form>
  );
}
