import { useState } from "react";
import { Button, FormError } from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { useDeleteJob } from "../api/delete-job";

/** Deleting a job cannot be undone, so it takes a second, explicit press. */
export function DeleteJobButton({
  jobId,
  title,
  onDeleted,
}: {
  jobId: string;
  title: string;
  onDeleted: () => void;
}) {
  const [confirming, setConfirming] = useState(false);
  const remove = useDeleteJob(jobId);
  if (!confirming) {
    return (
      <Button variant="secondary" onClick={() => setConfirming(true)}>
        Delete job
      </Button>
    );
  }
  return (
    <div
      role="group"
      aria-label="Confirm deleting the job"
      className="flex flex-col gap-2 rounded border border-risk/40 bg-risk-wash p-3"
    >
      <p className="text-sm">
        Delete <strong>{title}</strong> with its programme and bookings? This
        cannot be undone.
      </p>
      <FormError message={remove.isError ? errorMessage(remove.error) : null} />
      <div className="flex flex-wrap gap-2">
        <Button
          variant="danger"
          size="sm"
          busy={remove.isPending}
          onClick={() => remove.mutate(undefined, { onSuccess: onDeleted })}
        >
          Delete for good
        </Button>
        <Button
          variant="secondary"
          size="sm"
          autoFocus
          onClick={() => setConfirming(false)}
        >
          Keep the job
        </Button>
      </div>
    </div>
  );
}
