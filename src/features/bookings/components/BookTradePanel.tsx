import { zodResolver } from "@hookform/resolvers/zod";
import { useId, useState } from "react";
import { useForm, useWatch, type UseFormRegisterReturn } from "react-hook-form";
import { Link } from "react-router-dom";
import { z } from "zod";
import {
  arrivalWindowSchema,
  clockTimeSchema,
  createBookingBodySchema,
  isoDateSchema,
  type BookingOptionsResponse,
  type BookingResponse,
} from "../../../../shared/schemas";
import {
  Button,
  CautionNote,
  ErrorState,
  FormError,
  LoadingState,
  PartyChip,
  TextArea,
  TextField,
  cx,
} from "../../../components/ui";
import { isApiError } from "../../../lib/api-client";
import { applyServerErrors } from "../../../lib/form-errors";
import { formatDays } from "../../../lib/format";
import { arrivalChoiceLabels } from "../../../lib/labels";
import { useBookingOptions } from "../api/get-booking-options";
import { useCreateBooking } from "../api/create-booking";
import { useUpdateBooking } from "../api/update-booking";
import {
  aKind,
  dateOf,
  dayWords,
  halfOf,
  keptWords,
  kindNoun,
  startWords,
} from "../words";

const bookFormSchema = z
  .object({
    tradeId: z.string().min(1, "Choose a trade"),
    date: isoDateSchema,
    half: z.enum(["morning", "afternoon"]),
    arrivalWindow: arrivalWindowSchema,
    arrivalFrom: z.string(),
    arrivalTo: z.string(),
    shareAddress: z.boolean(),
  })
  .superRefine((v, ctx) => {
    if (v.arrivalWindow !== "range") return;
    for (const key of ["arrivalFrom", "arrivalTo"] as const) {
      const r = clockTimeSchema.safeParse(v[key]);
      if (!r.success)
        ctx.addIssue({
          code: "custom",
          path: [key],
          message: "Use a time like 08:00",
        });
    }
    if (v.arrivalFrom && v.arrivalTo && v.arrivalFrom >= v.arrivalTo)
      ctx.addIssue({
        code: "custom",
        path: ["arrivalTo"],
        message: "The range ends after it starts",
      });
  });
type Values = z.infer<typeof bookFormSchema>;

type TradeOption = BookingOptionsResponse["trades"][number];

interface Conflict {
  message: string;
  nextFreeStart: string | null;
  send: boolean;
  values: Values;
}

export interface BookTradePanelProps {
  jobId: string;
  taskId: string;
  /** The task's safety note, when it has one. */
  caution?: string | null;
  onBooked: (booking: BookingResponse) => void;
  onClose: () => void;
  /** A draft to change instead of a new booking: the form starts from it and saves it (PATCH). */
  editing?: BookingResponse;
}

/** Book a trade for one task: the window that keeps handover, each trade's first free start, the start and arrival. */
export function BookTradePanel(props: BookTradePanelProps) {
  const options = useBookingOptions(props.jobId, props.taskId);
  const headingId = useId();
  let body: React.ReactNode;
  if (options.isPending)
    body = <LoadingState label="Finding each trade's first free start…" />;
  else if (options.isError)
    body = (
      <ErrorState error={options.error} onRetry={() => options.refetch()} />
    );
  else body = <BookForm {...props} options={options.data} />;
  return (
    <section
      aria-labelledby={headingId}
      className="flex flex-col gap-3 rounded border border-accent/40 bg-paper p-4"
    >
      <h3 id={headingId} className="font-semibold">
        {props.editing ? "Change the draft" : "Book a trade"}
        {options.data ? `: ${options.data.taskName}` : ""}
      </h3>
      {body}
    </section>
  );
}

function WindowLine({ o }: { o: BookingOptionsResponse }) {
  if (!o.keepsHandover)
    return (
      <p className="text-sm">
        <span className="font-medium text-risk">Agreed handover at risk: </span>
        no start keeps the agreed handover. The earliest start is{" "}
        <span className="font-mono">{startWords(o.earliestStart)}</span>.
      </p>
    );
  if (dateOf(o.earliestStart) === dateOf(o.latestStart))
    return (
      <p className="text-sm">
        Only a start on{" "}
        <span className="font-mono">{dayWords(o.earliestStart)}</span> keeps{" "}
        {keptWords(o.handoverDate)}.
      </p>
    );
  return (
    <p className="text-sm">
      Starts from <span className="font-mono">{dayWords(o.earliestStart)}</span>{" "}
      to <span className="font-mono">{dayWords(o.latestStart)}</span> keep{" "}
      {keptWords(o.handoverDate)}.
    </p>
  );
}

function TradeChoice({
  trade,
  checked,
  register,
  kept,
}: {
  trade: TradeOption;
  checked: boolean;
  /** "handover", or "the planned finish" when no handover is agreed. */
  kept: string;
  register: UseFormRegisterReturn<"tradeId">;
}) {
  const f = trade.firstFree;
  return (
    <label
      className={cx(
        "flex cursor-pointer items-start gap-3 rounded border px-3 py-2",
        checked ? "border-accent bg-accent-wash" : "border-rule bg-card",
      )}
    >
      <input
        type="radio"
        value={trade.tradeId}
        className="mt-1.5 accent-accent"
        {...register}
      />
      <span className="flex min-w-0 flex-col gap-0.5">
        <span className="flex flex-wrap items-center gap-2">
          <span className="font-medium">{trade.businessName}</span>
          <PartyChip party={trade.kind} />
        </span>
        {f ? (
          <span className="text-sm">
            Free from <span className="font-mono">{startWords(f.start)}</span>
          </span>
        ) : (
          <span className="text-sm text-ink-soft">
            No free start found in the coming weeks
          </span>
        )}
        {f?.pastLateStart ? (
          <span className="text-sm font-medium text-risk">
            Past the latest start: {kept} would move
          </span>
        ) : null}
        {trade.declined ? (
          <span className="text-sm text-ink-soft">
            Declined this task before
          </span>
        ) : null}
      </span>
    </label>
  );
}

function BookForm({
  jobId,
  taskId,
  caution,
  options,
  onBooked,
  onClose,
  editing,
}: BookTradePanelProps & { options: BookingOptionsResponse }) {
  const create = useCreateBooking(jobId);
  const update = useUpdateBooking(jobId);
  const [formError, setFormError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [overriding, setOverriding] = useState(false);
  const [reason, setReason] = useState("");
  const [reasonError, setReasonError] = useState<string | null>(null);
  const [pending, setPending] = useState<"send" | "draft" | null>(null);

  const first =
    options.trades.find((t) => !t.declined && t.firstFree) ?? options.trades[0];
  // The half's own arrival when the workshop offers it, else the first arrival time it offers.
  const offered = (a: Values["arrivalWindow"]) =>
    options.arrivalWindows.includes(a) ? a : options.arrivalWindows[0];
  const form = useForm<Values>({
    resolver: zodResolver(bookFormSchema),
    defaultValues: editing
      ? {
          tradeId: editing.tradeId,
          date: dateOf(editing.start),
          half: halfOf(editing.start),
          arrivalWindow: editing.arrivalWindow,
          arrivalFrom: editing.arrivalFrom ?? "08:00",
          arrivalTo: editing.arrivalTo ?? "09:00",
          shareAddress: editing.shareAddress,
        }
      : {
          tradeId: first?.tradeId ?? "",
          date: first?.firstFree ? dateOf(first.firstFree.start) : "",
          half: first?.firstFree ? halfOf(first.firstFree.start) : "morning",
          arrivalWindow: offered(
            first?.firstFree ? halfOf(first.firstFree.start) : "morning",
          ),
          arrivalFrom: "08:00",
          arrivalTo: "09:00",
          shareAddress: false,
        },
  });
  const { errors } = form.formState;
  const [tradeId, date, half, arrivalWindow] = useWatch({
    control: form.control,
    name: ["tradeId", "date", "half", "arrivalWindow"],
  });
  const chosen = options.trades.find((t) => t.tradeId === tradeId);
  const kind = kindNoun(options.party);

  const applyStart = (start: string) => {
    form.setValue("date", dateOf(start), { shouldValidate: true });
    form.setValue("half", halfOf(start));
    const a = form.getValues("arrivalWindow");
    if (a === "morning" || a === "afternoon")
      form.setValue("arrivalWindow", offered(halfOf(start)));
  };

  async function submit(values: Values, send: boolean, override?: string) {
    setFormError(null);
    setPending(send ? "send" : "draft");
    const body = createBookingBodySchema.parse({
      taskId,
      tradeId: values.tradeId,
      start: values.half === "afternoon" ? `${values.date}T12:00` : values.date,
      arrivalWindow: values.arrivalWindow,
      arrivalFrom: values.arrivalWindow === "range" ? values.arrivalFrom : null,
      arrivalTo: values.arrivalWindow === "range" ? values.arrivalTo : null,
      shareAddress: values.shareAddress,
      overrideReason: override ?? null,
      send,
    });
    try {
      const booking = editing
        ? await update.mutateAsync({
            bookingId: editing.id,
            body: {
              tradeId: body.tradeId,
              start: body.start,
              arrivalWindow: body.arrivalWindow,
              arrivalFrom: body.arrivalFrom,
              arrivalTo: body.arrivalTo,
              shareAddress: body.shareAddress,
              // A change that clears the clash drops the old reason on the server.
              overrideReason: override ?? editing.overrideReason,
            },
          })
        : await create.mutateAsync(body);
      setConflict(null);
      onBooked(booking);
    } catch (error) {
      if (
        isApiError(error) &&
        error.status === 409 &&
        error.code === "conflict" &&
        error.fields?.start
      ) {
        setConflict({
          message: error.message,
          nextFreeStart: error.fields.nextFreeStart?.[0] ?? null,
          send,
          values,
        });
        setOverriding(false);
        setReason("");
      } else {
        setFormError(
          applyServerErrors(error, form.setError, [
            "tradeId",
            "arrivalFrom",
            "arrivalTo",
          ]),
        );
      }
    } finally {
      setPending(null);
    }
  }

  const bookAnyway = async () => {
    if (!conflict) return;
    if (!reason.trim()) {
      setReasonError("Say why this booking should stand anyway");
      return;
    }
    setReasonError(null);
    await submit(conflict.values, conflict.send, reason.trim());
  };

  if (options.trades.length === 0)
    return (
      <div className="flex flex-col gap-2 text-sm">
        <p>
          The workshop has no {kind} among its trades yet.{" "}
          <Link
            to="/trades"
            className="text-accent underline underline-offset-2"
          >
            Add one on the Trades page
          </Link>
          .
        </p>
        <Button
          variant="secondary"
          size="sm"
          className="self-start"
          onClick={onClose}
        >
          Close
        </Button>
      </div>
    );

  const afterLatest =
    options.keepsHandover && date && date > dateOf(options.latestStart);

  return (
    <form
      noValidate
      aria-label={
        editing
          ? `Change the draft booking for ${options.taskName}`
          : `Book ${aKind(options.party)} for ${options.taskName}`
      }
      // A draft being changed is saved, never sent, by Enter.
      onSubmit={form.handleSubmit((v) => submit(v, !editing))}
      className="flex flex-col gap-4"
    >
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
        <PartyChip party={options.party} />
        <span className="font-mono text-ink-soft">
          {formatDays(options.durationDays)}
        </span>
      </div>
      <WindowLine o={options} />
      {caution ? <CautionNote>{caution}</CautionNote> : null}
      <FormError message={formError} />

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-medium">Which {kind}</legend>
        {options.trades.map((t) => (
          <TradeChoice
            key={t.tradeId}
            trade={t}
            checked={t.tradeId === tradeId}
            kept={keptWords(options.handoverDate)}
            register={form.register("tradeId", {
              onChange: () => {
                setConflict(null);
                if (t.firstFree) applyStart(t.firstFree.start);
              },
            })}
          />
        ))}
        {errors.tradeId ? (
          <p className="text-sm font-medium text-risk">
            {errors.tradeId.message}
          </p>
        ) : null}
      </fieldset>

      <div className="flex flex-wrap items-end gap-4">
        <TextField
          label="Start"
          type="date"
          error={errors.date?.message}
          inputClassName="font-mono"
          {...form.register("date", { onChange: () => setConflict(null) })}
        />
        <fieldset className="flex flex-wrap gap-3">
          <legend className="sr-only">Start in the</legend>
          {(["morning", "afternoon"] as const).map((h) => (
            <label key={h} className="flex min-h-10 items-center gap-2 text-sm">
              <input
                type="radio"
                value={h}
                className="accent-accent"
                {...form.register("half", {
                  onChange: () => {
                    setConflict(null);
                    const a = form.getValues("arrivalWindow");
                    if (a === "morning" || a === "afternoon")
                      form.setValue("arrivalWindow", offered(h));
                  },
                })}
              />
              {h === "morning" ? "Morning" : "Afternoon"}
            </label>
          ))}
        </fieldset>
      </div>
      {chosen?.firstFree &&
      (date !== dateOf(chosen.firstFree.start) ||
        half !== halfOf(chosen.firstFree.start)) ? (
        <p className="-mt-2 text-sm text-ink-soft">
          {chosen.businessName} is first free{" "}
          <span className="font-mono">
            {startWords(chosen.firstFree.start)}
          </span>
          .{" "}
          <Button
            variant="quiet"
            size="sm"
            onClick={() => applyStart(chosen.firstFree!.start)}
          >
            Use their first free start
          </Button>
        </p>
      ) : null}
      {afterLatest ? (
        <p className="-mt-2 text-sm font-medium text-risk">
          Past the latest start: {keptWords(options.handoverDate)} would move
        </p>
      ) : null}

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-medium">Arrival window</legend>
        <div className="flex flex-wrap gap-x-4 gap-y-1">
          {/* Only the arrival times the workshop offers (its settings, issue 14). */}
          {options.arrivalWindows.map((value) => (
            <label
              key={value}
              className="flex min-h-10 items-center gap-2 text-sm"
            >
              <input
                type="radio"
                value={value}
                className="accent-accent"
                {...form.register("arrivalWindow")}
              />
              {arrivalChoiceLabels[value]}
            </label>
          ))}
        </div>
        {arrivalWindow === "range" ? (
          <div className="flex flex-wrap gap-4">
            <TextField
              label="From"
              type="time"
              step={900}
              inputClassName="font-mono"
              error={errors.arrivalFrom?.message}
              {...form.register("arrivalFrom")}
            />
            <TextField
              label="To"
              type="time"
              step={900}
              inputClassName="font-mono"
              error={errors.arrivalTo?.message}
              {...form.register("arrivalTo")}
            />
          </div>
        ) : null}
      </fieldset>

      <label className="flex items-start gap-2 text-sm">
        <input
          type="checkbox"
          className="mt-1 accent-accent"
          {...form.register("shareAddress")}
        />
        <span>
          Share the full address and access notes before they confirm
          <span className="block text-ink-soft">
            Otherwise they see the area only, and the address once they confirm.
          </span>
        </span>
      </label>

      {conflict ? (
        <div
          role="alert"
          className="flex flex-col gap-2 rounded border border-wait/60 border-l-4 border-l-wait bg-wait-wash px-3 py-3 text-sm"
        >
          <p className="font-semibold">That start does not work for them</p>
          <p>{conflict.message}</p>
          <div className="flex flex-wrap gap-2">
            {conflict.nextFreeStart ? (
              <Button
                size="sm"
                onClick={() => {
                  applyStart(conflict.nextFreeStart!);
                  setConflict(null);
                }}
              >
                Use their next free start ({startWords(conflict.nextFreeStart)})
              </Button>
            ) : null}
            {!overriding ? (
              <Button
                size="sm"
                variant="secondary"
                onClick={() => setOverriding(true)}
              >
                Book anyway
              </Button>
            ) : null}
          </div>
          {overriding ? (
            <div className="flex flex-col gap-2">
              <TextArea
                label="Why book on this start anyway"
                rows={2}
                value={reason}
                error={reasonError ?? undefined}
                hint="Kept with the booking's history."
                onChange={(e) => setReason(e.target.value)}
              />
              <div className="flex flex-wrap gap-2">
                <Button
                  size="sm"
                  variant="danger"
                  busy={pending !== null}
                  onClick={bookAnyway}
                >
                  {conflict.send
                    ? "Book anyway and send"
                    : editing
                      ? "Save the draft anyway"
                      : "Book anyway as a draft"}
                </Button>
                <Button
                  size="sm"
                  variant="secondary"
                  onClick={() => setOverriding(false)}
                >
                  Back
                </Button>
              </div>
            </div>
          ) : null}
        </div>
      ) : null}

      <div className="flex flex-wrap gap-2">
        {editing ? (
          <Button
            busy={pending === "draft"}
            disabled={pending !== null}
            onClick={form.handleSubmit((v) => submit(v, false))}
          >
            Save the draft
          </Button>
        ) : (
          <>
            <Button
              type="submit"
              busy={pending === "send"}
              disabled={pending !== null}
            >
              {chosen ? `Send to ${chosen.businessName}` : "Send"}
            </Button>
            <Button
              variant="secondary"
              busy={pending === "draft"}
              disabled={pending !== null}
              onClick={form.handleSubmit((v) => submit(v, false))}
            >
              Save as draft
            </Button>
          </>
        )}
        <Button variant="quiet" onClick={onClose} disabled={pending !== null}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
