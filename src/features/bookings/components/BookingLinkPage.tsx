import { zodResolver } from "@hookform/resolvers/zod";
import { useState, type ReactNode } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import {
  linkAnswerBodySchema,
  type LinkPageResponse,
} from "../../../../shared/schemas";
import {
  BookingStateBadge,
  Button,
  Card,
  CautionNote,
  ErrorState,
  FormError,
  LoadingState,
  PageHeader,
  TextArea,
} from "../../../components/ui";
import { errorMessage, isApiError } from "../../../lib/api-client";
import { useAnswerByLink } from "../api/answer-by-link";
import { useLinkPage } from "../api/get-link-page";
import { dayWords, keptWords, todayLocal, visitWords } from "../words";
import { MarkedDatePicker } from "./DatePicker";

type AnswerValues = z.input<typeof linkAnswerBodySchema>;

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-0.5 border-b border-rule py-3 first:pt-0 last:border-b-0 last:pb-0">
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="min-w-0">{children}</dd>
    </div>
  );
}

function InvalidLink() {
  return (
    <>
      <PageHeader title="This link does not work" />
      <Card className="p-5">
        <div role="alert" className="flex flex-col gap-2">
          <p className="font-semibold">
            This link is not valid or has expired — ask the workshop for a new
            one.
          </p>
          <p className="text-sm">
            It may have been copied incompletely, or the booking is long past.
            Nothing has been changed.
          </p>
        </div>
      </Card>
    </>
  );
}

const waitsOnState: Record<string, string> = {
  done: "done",
  started: "started",
  planned: "planned",
};

function WaitsOn({ page }: { page: LinkPageResponse }) {
  if (page.waitsOn.length === 0)
    return <p className="text-sm">Nothing: it can start any time.</p>;
  return (
    <ul className="flex flex-col gap-1">
      {page.waitsOn.map((w) => (
        <li key={w.name}>
          <span className="font-medium">{w.name}</span>
          {" — "}
          {w.state === "done" ? (
            "done"
          ) : w.plannedFinish ? (
            <>
              {w.state === "started" ? "started, " : ""}planned to finish{" "}
              <span className="font-mono">{dayWords(w.plannedFinish)}</span>
            </>
          ) : (
            (waitsOnState[w.state] ?? w.state)
          )}
        </li>
      ))}
    </ul>
  );
}

function StartWindow({ page }: { page: LinkPageResponse }) {
  const d = page.windowDates;
  const kept = page.handoverDate ? "the handover date" : "the planned finish";
  if (d.length === 0 || !page.handoverKept)
    return (
      <p className="text-sm">
        No start keeps {kept} now; the workshop is re-planning.
      </p>
    );
  if (d.length === 1)
    return (
      <p className="text-sm">
        Only a start on <span className="font-mono">{dayWords(d[0])}</span>{" "}
        keeps {kept}.
      </p>
    );
  return (
    <p className="text-sm">
      Starts from <span className="font-mono">{dayWords(d[0])}</span> to{" "}
      <span className="font-mono">{dayWords(d[d.length - 1])}</span> keep {kept}
      .
    </p>
  );
}

/** What the trade's answer was, or what they are asked; the first thing on the page. */
export function BookingAnswerBanner({ page }: { page: LinkPageResponse }) {
  const box = (
    tone: "ok" | "wait" | "risk" | "accent",
    children: ReactNode,
  ) => (
    <div
      role="status"
      className={
        {
          ok: "rounded border border-ok/40 bg-ok-wash px-4 py-3",
          wait: "rounded border border-wait/50 bg-wait-wash px-4 py-3",
          risk: "rounded border border-risk/40 bg-risk-wash px-4 py-3",
          accent: "rounded border border-accent/30 bg-accent-wash px-4 py-3",
        }[tone]
      }
    >
      {children}
    </div>
  );
  if (page.status === "cancelled")
    return box(
      "risk",
      <>
        <p className="font-semibold">This booking was cancelled</p>
        <p className="text-sm">
          {page.workshopName} cancelled it
          {page.cancelledOn ? ` on ${dayWords(page.cancelledOn)}` : ""}. There
          is nothing to confirm; it has left your calendar too.
        </p>
      </>,
    );
  if (page.status === "dates-changed")
    return box(
      "wait",
      <>
        <p className="font-semibold">The dates of this booking have changed</p>
        <p className="text-sm">
          The new dates are below. The newest e-mail from {page.workshopName}{" "}
          has the working link to answer them.
        </p>
      </>,
    );
  switch (page.state) {
    case "confirmed":
      return box(
        "ok",
        <p className="font-semibold">
          You confirmed {dayWords(page.start)} — thank you.
        </p>,
      );
    case "declined":
      return box(
        "risk",
        <>
          <p className="font-semibold">You said you can't make it</p>
          <p className="text-sm">{page.workshopName} has been told.</p>
        </>,
      );
    case "date-proposed":
      return box(
        "wait",
        <>
          <p className="font-semibold">
            You proposed to start{" "}
            {page.proposedStart ? dayWords(page.proposedStart) : "another day"}
          </p>
          <p className="text-sm">
            {page.workshopName} will accept it or come back to you.
          </p>
        </>,
      );
    case "needs-reconfirming":
      return box(
        "accent",
        <p className="font-semibold">
          The dates have moved: can you still come on the new dates?
        </p>,
      );
    default:
      return box(
        "accent",
        <p className="font-semibold">
          {page.workshopName} would like to book you. Can you come?
        </p>,
      );
  }
}

/** Sends an answer; resolves when it is recorded (the page is then refreshed by the caller's hook). */
export interface AnswerSender {
  mutateAsync: (
    body: z.output<typeof linkAnswerBodySchema>,
  ) => Promise<unknown>;
  isPending: boolean;
  variables?: { answer: string };
}

function LinkActions({
  token,
  page,
  ready,
}: {
  token: string;
  page: LinkPageResponse;
  ready: boolean;
}) {
  const answer = useAnswerByLink(token);
  return <BookingAnswerForm page={page} ready={ready} answer={answer} />;
}

/**
 * Confirm / Can't make it / Propose another start, for one booking page. The sender is the link's
 * answer or the signed-in trade's: the form is the same.
 */
export function BookingAnswerForm({
  page,
  ready,
  answer,
}: {
  page: LinkPageResponse;
  ready: boolean;
  answer: AnswerSender;
}) {
  const [open, setOpen] = useState<"decline" | "propose" | null>(null);
  const [error, setError] = useState<string | null>(null);
  const form = useForm<
    AnswerValues,
    unknown,
    z.output<typeof linkAnswerBodySchema>
  >({
    resolver: zodResolver(linkAnswerBodySchema),
    defaultValues: { answer: "confirm", proposedStart: null, reason: "" },
  });
  const proposed = useWatch({ control: form.control, name: "proposedStart" });
  const { errors } = form.formState;

  const send = async (body: z.output<typeof linkAnswerBodySchema>) => {
    setError(null);
    try {
      await answer.mutateAsync(body);
      setOpen(null);
      form.reset({ answer: "confirm", proposedStart: null, reason: "" });
    } catch (e) {
      setError(
        isApiError(e) && e.status === 409 ? `${e.message}` : errorMessage(e),
      );
    }
  };
  const choose = (which: "decline" | "propose") => {
    form.clearErrors();
    form.setValue("answer", which);
    setOpen(open === which ? null : which);
  };
  const onSubmit = form.handleSubmit(send);
  const confirmed = page.state === "confirmed";

  return (
    <section aria-labelledby="answer-heading" className="flex flex-col gap-3">
      <h2 id="answer-heading" className="text-base font-semibold">
        {confirmed ? "Something changed?" : "Your answer"}
      </h2>
      <FormError message={error} />
      <div className="flex flex-col gap-2 sm:flex-row sm:flex-wrap">
        {!confirmed ? (
          <Button
            className="w-full sm:w-auto"
            busy={answer.isPending && answer.variables?.answer === "confirm"}
            disabled={!ready || answer.isPending}
            onClick={() =>
              send({ answer: "confirm", proposedStart: null, reason: "" })
            }
          >
            Confirm {dayWords(page.start)}
          </Button>
        ) : null}
        <Button
          variant="secondary"
          className="w-full sm:w-auto"
          aria-expanded={open === "decline"}
          disabled={!ready || answer.isPending}
          onClick={() => choose("decline")}
        >
          Can't make it
        </Button>
        <Button
          variant="secondary"
          className="w-full sm:w-auto"
          aria-expanded={open === "propose"}
          disabled={!ready || answer.isPending}
          onClick={() => choose("propose")}
        >
          Propose another start
        </Button>
      </div>
      {open === "decline" ? (
        <form
          noValidate
          onSubmit={onSubmit}
          aria-label="Can't make it"
          className="flex flex-col gap-3 rounded border border-rule bg-card p-4"
        >
          <TextArea
            label="Why can't you make it?"
            hint={`${page.workshopName} sees this with your answer.`}
            rows={3}
            error={errors.reason?.message}
            {...form.register("reason")}
          />
          <Button
            type="submit"
            variant="danger"
            className="w-full sm:w-auto sm:self-start"
            busy={answer.isPending}
          >
            Send: I can't make it
          </Button>
        </form>
      ) : null}
      {open === "propose" ? (
        <form
          noValidate
          onSubmit={onSubmit}
          aria-label="Propose another start"
          className="flex flex-col gap-3 rounded border border-rule bg-card p-4"
        >
          <MarkedDatePicker
            label="Choose the start you propose"
            windowDates={page.windowDates}
            kept={keptWords(page.handoverDate)}
            freeDates={page.freeDates}
            from={todayLocal()}
            value={proposed ?? null}
            onChange={(d) =>
              form.setValue("proposedStart", d, { shouldValidate: true })
            }
          />
          {errors.proposedStart ? (
            <p className="text-sm font-medium text-risk">
              {errors.proposedStart.message}
            </p>
          ) : null}
          {proposed &&
          page.windowDates.length > 0 &&
          !page.windowDates.includes(proposed) ? (
            <p className="text-sm text-wait-ink">
              {dayWords(proposed)} is outside the dates that keep{" "}
              {keptWords(page.handoverDate)}; the workshop may not be able to
              accept it.
            </p>
          ) : null}
          <TextArea
            label="Anything to add"
            optional
            rows={2}
            error={errors.reason?.message}
            {...form.register("reason")}
          />
          <Button
            type="submit"
            className="w-full sm:w-auto sm:self-start"
            busy={answer.isPending}
          >
            {proposed ? `Propose ${dayWords(proposed)}` : "Propose this start"}
          </Button>
        </form>
      ) : null}
    </section>
  );
}

/**
 * The trade's confirmation page, opened from the e-mail on a phone without an account: who asks,
 * what, where, when, what it waits on, and Confirm / Can't make it / Propose another start.
 */
export function BookingLinkPage({
  token,
  ready,
}: {
  token: string;
  /** The CSRF token is in hand (the signed-out session has loaded): answers can be sent. */
  ready: boolean;
}) {
  const page = useLinkPage(token);
  if (page.isPending)
    return (
      <>
        <h1 className="sr-only">Your booking</h1>
        <LoadingState label="Opening your booking…" />
      </>
    );
  if (page.isError) {
    if (
      isApiError(page.error) &&
      (page.error.code === "token-invalid" ||
        page.error.status === 404 ||
        page.error.status === 400)
    )
      return <InvalidLink />;
    return (
      <>
        <PageHeader title="Your booking" />
        <ErrorState
          error={page.error}
          title="Your booking could not be loaded"
          onRetry={() => page.refetch()}
        />
      </>
    );
  }
  const p = page.data;
  const canAnswer = p.status === "current" && p.canAnswer;
  return (
    <>
      <PageHeader
        title={p.taskName}
        eyebrow={`Booking from ${p.workshopName}`}
        description={`For ${p.tradeBusinessName}`}
      />
      <div className="flex flex-col gap-5">
        <BookingAnswerBanner page={p} />
        <BookingFacts page={p} />
        {canAnswer ? (
          <LinkActions token={token} page={p} ready={ready} />
        ) : null}
      </div>
    </>
  );
}

/** The booking's facts as the trade sees them: when, where, access, what it waits for, the start window, the caution. */
export function BookingFacts({ page: p }: { page: LinkPageResponse }) {
  // A cancelled booking offers nothing to confirm: no "once you confirm", no start window.
  const cancelled = p.status === "cancelled";
  return (
    <>
      <Card className="p-4">
        <dl className="flex flex-col">
          <Row label="When">
            <span className="flex flex-wrap items-center gap-2">
              <span className="font-mono font-medium">{visitWords(p)}</span>
              {/* "Sent" is the workshop's word: the box above asks the question instead. */}
              {p.status === "current" &&
              p.state !== "sent" &&
              p.state !== "needs-reconfirming" ? (
                <BookingStateBadge state={p.state} />
              ) : null}
            </span>
          </Row>
          <Row label="Where">
            <span className="block">{p.jobArea}</span>
            {p.siteAddress ? (
              <span className="mt-1 block font-medium whitespace-pre-line">
                {p.siteAddress}
              </span>
            ) : cancelled ? null : (
              <span className="mt-1 block text-sm text-ink-soft">
                The full address and access notes are shown once you confirm.
              </span>
            )}
          </Row>
          {p.accessNotes ? (
            <Row label="Access notes">
              <span className="whitespace-pre-line">{p.accessNotes}</span>
            </Row>
          ) : null}
          <Row label="It waits for">
            <WaitsOn page={p} />
          </Row>
          {cancelled ? null : (
            <Row label={`Start dates that keep ${keptWords(p.handoverDate)}`}>
              <StartWindow page={p} />
            </Row>
          )}
          {p.customerNote ? (
            <Row label="On site">
              <span className="whitespace-pre-line">{p.customerNote}</span>
            </Row>
          ) : null}
        </dl>
      </Card>
      {p.caution ? <CautionNote>{p.caution}</CautionNote> : null}
    </>
  );
}
