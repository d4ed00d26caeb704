import type { SettingsPreview } from "../../../../shared/schemas";
import { CautionNote } from "../../../components/ui";
import { formatDateShort } from "../../../lib/format";
import { finishText, startText, workingDaysText } from "../../../lib/knock-on";

/**
 * What a settings change does to the open jobs, as the server's engine run found it: each job's
 * finish before and after, a handover it puts at risk, and the bookings that would go back to the
 * trade to confirm again.
 */
export function KnockOn({ preview }: { preview: SettingsPreview }) {
  const toReconfirm = preview.jobs.reduce((n, j) => n + j.bookings.length, 0);
  return (
    <section aria-labelledby="knock-on-heading" className="flex flex-col gap-3">
      <h3 id="knock-on-heading" className="text-base font-semibold">
        This change re-plans{" "}
        {preview.jobs.length === 1
          ? "1 open job"
          : `${preview.jobs.length} open jobs`}
      </h3>
      <p className="text-sm text-ink-soft">
        Check what moves before you save.
        {preview.unchangedJobs > 0
          ? ` ${preview.unchangedJobs === 1 ? "1 other open job stays" : `${preview.unchangedJobs} other open jobs stay`} as planned.`
          : ""}
      </p>
      {toReconfirm > 0 ? (
        <CautionNote>
          {toReconfirm === 1
            ? "1 booking moves and goes back to its trade to confirm again."
            : `${toReconfirm} bookings move and go back to their trades to confirm again.`}
        </CautionNote>
      ) : null}
      <ul className="flex flex-col gap-3">
        {preview.jobs.map((j) => (
          <li key={j.jobId} className="rounded border border-rule px-3 py-3">
            <p className="font-semibold break-words">{j.title}</p>
            <p className="text-sm">
              Finish:{" "}
              <span className="font-mono">
                {j.finishBefore ? finishText(j.finishBefore) : "not planned"}
              </span>{" "}
              →{" "}
              <span className="font-mono">
                {j.finishAfter ? finishText(j.finishAfter) : "not planned"}
              </span>
              {j.changeDays !== 0
                ? ` (${workingDaysText(Math.abs(j.changeDays))} ${j.changeDays > 0 ? "later" : "sooner"})`
                : ""}
            </p>
            {j.handoverAtRisk ? (
              <p className="text-sm font-medium text-risk">
                Handover
                {j.handoverDate ? ` ${formatDateShort(j.handoverDate)}` : ""} at
                risk
                {j.handoverAtRiskBefore ? " (it already was)" : ""}
              </p>
            ) : j.handoverAtRiskBefore ? (
              <p className="text-sm text-ink-soft">
                Handover no longer at risk
              </p>
            ) : null}
            {j.nationFollows ? (
              <p className="text-sm text-ink-soft">
                The site follows the workshop&apos;s new bank holidays.
              </p>
            ) : null}
            {j.bookings.length > 0 ? (
              <ul className="mt-2 flex flex-col gap-1 text-sm">
                {j.bookings.map((b) => (
                  <li key={b.bookingId}>
                    <span className="font-medium">{b.taskName}</span> with{" "}
                    {b.tradeName}: booked{" "}
                    <span className="font-mono">
                      {startText(b.bookedStart)}
                    </span>
                    {b.proposedStart ? (
                      <>
                        , moves to{" "}
                        <span className="font-mono">
                          {startText(b.proposedStart)}
                        </span>{" "}
                        and needs re-confirming
                      </>
                    ) : (
                      ", no longer fits: re-book it from the job"
                    )}
                    . <span className="text-ink-soft">{b.reason}.</span>
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        ))}
      </ul>
    </section>
  );
}
