import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { useRef, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { z } from "zod";
import {
  cancelBookingBodySchema,
  recordAnswerBodySchema,
  type BookingResponse,
} from "../../../../shared/schemas";
import { Button, FormError, TextArea, TextField } from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { applyServerErrors } from "../../../lib/form-errors";
import { useCancelBooking } from "../api/cancel-booking";
import { bookingLinkQueryOptions } from "../api/get-booking-link";
import { useRecordAnswer } from "../api/record-answer";

type AnswerValues = z.input<typeof recordAnswerBodySchema>;

/** The maker records an answer the trade gave by phone or text. */
export function RecordAnswerForm({
  jobId,
  booking,
  onDone,
  onCancel,
}: {
  jobId: string;
  booking: BookingResponse;
  onDone: (b: BookingResponse) => void;
  onCancel: () => void;
}) {
  const record = useRecordAnswer(jobId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<
    AnswerValues,
    unknown,
    z.output<typeof recordAnswerBodySchema>
  >({
    resolver: zodResolver(recordAnswerBodySchema),
    defaultValues: {
      answer: "confirm",
      channel: "phone",
      proposedStart: null,
      note: "",
    },
  });
  const answer = useWatch({ control: form.control, name: "answer" });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFormError(null);
    try {
      const b = await record.mutateAsync({
        bookingId: booking.id,
        body: {
          ...body,
          proposedStart: body.answer === "propose" ? body.proposedStart : null,
        },
      });
      onDone(b);
    } catch (error) {
      setFormError(
        applyServerErrors(error, form.setError, ["proposedStart", "note"]),
      );
    }
  });
  return (
    <form
      noValidate
      onSubmit={onSubmit}
      aria-label={`Record ${booking.tradeBusinessName}'s answer`}
      className="flex flex-col gap-3 rounded border border-rule bg-paper p-3"
    >
      <FormError message={formError} />
      <fieldset className="flex flex-wrap gap-x-4 gap-y-1">
        <legend className="mb-1 text-sm font-medium">How they answered</legend>
        {(
          [
            ["phone", "By phone"],
            ["text", "By text message"],
          ] as const
        ).map(([v, label]) => (
          <label key={v} className="flex min-h-9 items-center gap-2 text-sm">
            <input
              type="radio"
              value={v}
              className="accent-accent"
              {...form.register("channel")}
            />
            {label}
          </label>
        ))}
      </fieldset>
      <fieldset className="flex flex-wrap gap-x-4 gap-y-1">
        <legend className="mb-1 text-sm font-medium">Their answer</legend>
        {(
          [
            ["confirm", "Confirmed"],
            ["decline", "Can't make it"],
            ["propose", "Proposes another start"],
          ] as const
        ).map(([v, label]) => (
          <label key={v} className="flex min-h-9 items-center gap-2 text-sm">
            <input
              type="radio"
              value={v}
              className="accent-accent"
              {...form.register("answer")}
            />
            {label}
          </label>
        ))}
      </fieldset>
      {answer === "propose" ? (
        <TextField
          label="The start they propose"
          type="date"
          inputClassName="font-mono"
          className="max-w-xs"
          error={errors.proposedStart?.message}
          {...form.register("proposedStart", {
            setValueAs: (v: string) => (v ? v : null),
          })}
        />
      ) : null}
      <TextArea
        label="Note"
        optional
        rows={2}
        hint={answer === "decline" ? "Why they can't make it." : undefined}
        error={errors.note?.message}
        {...form.register("note")}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" size="sm" busy={isSubmitting}>
          Record answer
        </Button>
        <Button
          variant="secondary"
          size="sm"
          onClick={onCancel}
          disabled={isSubmitting}
        >
          Back
        </Button>
      </div>
    </form>
  );
}

type CancelValues = z.input<typeof cancelBookingBodySchema>;

/** Cancel a booking with a reason; the trade's calendar entry is cancelled too. */
export function CancelBookingForm({
  jobId,
  booking,
  onDone,
  onCancel,
}: {
  jobId: string;
  booking: BookingResponse;
  onDone: (b: BookingResponse) => void;
  onCancel: () => void;
}) {
  const cancel = useCancelBooking(jobId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<CancelValues>({
    resolver: zodResolver(cancelBookingBodySchema),
    defaultValues: { reason: "" },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFormError(null);
    try {
      onDone(await cancel.mutateAsync({ bookingId: booking.id, body }));
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["reason"]));
    }
  });
  return (
    <form
      noValidate
      onSubmit={onSubmit}
      aria-label={`Cancel the booking of ${booking.tradeBusinessName}`}
      className="flex flex-col gap-3 rounded border border-risk/40 bg-risk-wash p-3"
    >
      <FormError message={formError} />
      <TextArea
        label="Why is it cancelled"
        rows={2}
        hint={
          booking.state === "draft"
            ? undefined
            : `${booking.tradeBusinessName} is told, and the visit leaves their calendar.`
        }
        error={errors.reason?.message}
        {...form.register("reason")}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" size="sm" busy={isSubmitting}>
          Cancel the booking
        </Button>
        <Button
          variant="secondary"
          size="sm"
          onClick={onCancel}
          disabled={isSubmitting}
        >
          Keep it
        </Button>
      </div>
    </form>
  );
}

/**
 * Copies the confirmation link to paste into a text message; where the clipboard is not
 * available (an insecure origin, a refusing browser) the link is shown selected instead.
 */
export function CopyLinkButton({ booking }: { booking: BookingResponse }) {
  const queryClient = useQueryClient();
  const [state, setState] = useState<
    | { kind: "idle" }
    | { kind: "busy" }
    | { kind: "copied" }
    | { kind: "shown"; url: string }
    | { kind: "error"; message: string }
  >({ kind: "idle" });
  const field = useRef<HTMLInputElement>(null);

  const copy = async () => {
    setState({ kind: "busy" });
    let url: string;
    try {
      url = (await queryClient.fetchQuery(bookingLinkQueryOptions(booking.id)))
        .url;
    } catch (error) {
      setState({ kind: "error", message: errorMessage(error) });
      return;
    }
    try {
      if (!navigator.clipboard) throw new Error("no clipboard");
      // A browser that neither allows nor refuses (no permission prompt) would leave this
      // pending for ever: after a moment the link is shown to copy by hand instead.
      await Promise.race([
        navigator.clipboard.writeText(url),
        new Promise((_, reject) =>
          setTimeout(() => reject(new Error("clipboard timeout")), 1500),
        ),
      ]);
      setState({ kind: "copied" });
    } catch {
      setState({ kind: "shown", url });
      requestAnimationFrame(() => field.current?.select());
    }
  };

  return (
    <div className="flex flex-col gap-1">
      <Button
        variant="secondary"
        size="sm"
        // Its own width, not the width of a long message or link shown below it.
        className="self-start"
        busy={state.kind === "busy"}
        onClick={copy}
        aria-label={`Copy link: the confirmation link for ${booking.tradeBusinessName}`}
      >
        Copy link
      </Button>
      {state.kind === "copied" ? (
        <p role="status" className="text-sm text-ok">
          Link copied: paste it into a text message.
        </p>
      ) : null}
      {state.kind === "shown" ? (
        <TextField
          ref={field}
          label="Confirmation link: copy it into a text message"
          readOnly
          value={state.url}
          inputClassName="font-mono text-xs"
          onFocus={(e) => e.currentTarget.select()}
        />
      ) : null}
      {state.kind === "error" ? <FormError message={state.message} /> : null}
    </div>
  );
}
