import { useState } from "react";
import { useNavigate } from "react-router-dom";
import { AddCustomerForm } from "../../features/customers/components/AddCustomerForm";
import { useStarterNames } from "../../features/jobs/components/starter-names";
import { useWorkshop } from "../../features/settings/api/get-workshop";
import { useUpdateWorkshop } from "../../features/settings/api/update-workshop";
import {
  SettingsForm,
  type SettingsGroup,
} from "../../features/settings/components/SettingsForm";
import { setupSteps, type SetupStep } from "../../../shared/schemas";
import {
  Button,
  ErrorState,
  FormError,
  LinkButton,
  LoadingState,
  Notice,
  PageHeader,
  Section,
} from "../../components/ui";
import { errorMessage } from "../../lib/api-client";
import { useActiveWorkshop } from "../active-workshop";
import { MembersOnly } from "./members-only";

const stepTitles: Record<SetupStep, string> = {
  nation: "Nation and time zone",
  days: "Working days and hours",
  arrivals: "Arrival times and reminders",
  next: "Next steps",
};
const stepHints: Record<Exclude<SetupStep, "next">, string> = {
  nation:
    "Bank holidays follow the nation; the programme runs on the workshop's local time.",
  days: "The days and hours the workshop works, and the days sites usually let trades in.",
  arrivals:
    "What you offer a trade when you book them, and when their reminder goes.",
};
const settingSteps = setupSteps.filter(
  (s): s is Exclude<SetupStep, "next"> => s !== "next",
);
const after = (s: SetupStep): SetupStep =>
  setupSteps[Math.min(setupSteps.indexOf(s) + 1, setupSteps.length - 1)];

/** The short set-up after sign-up (owner): every step can be skipped and come back to. */
export function SetupRoute() {
  const { active } = useActiveWorkshop();
  if (!active || active.role !== "owner")
    return <MembersOnly title="Set up your workshop" ownerOnly />;
  return <SetupPage workshopId={active.workshopId} />;
}

function SetupPage({ workshopId }: { workshopId: string }) {
  const workshop = useWorkshop(workshopId);
  const update = useUpdateWorkshop(workshopId);
  const navigate = useNavigate();
  const [step, setStep] = useState<SetupStep | null>(null);
  const [customerAdded, setCustomerAdded] = useState<string | null>(null);
  const [addingCustomer, setAddingCustomer] = useState(false);
  const starterNames = useStarterNames(workshopId);

  if (workshop.isPending)
    return <LoadingState label="Loading your workshop…" />;
  if (workshop.isError)
    return (
      <ErrorState error={workshop.error} onRetry={() => workshop.refetch()} />
    );
  // Where the owner left off, remembered on the workshop.
  const current = step ?? workshop.data.setupStep ?? "nation";
  const goTo = (next: SetupStep) =>
    update.mutate({ setupStep: next }, { onSuccess: () => setStep(next) });
  const finish = () =>
    update.mutate({ setupDone: true }, { onSuccess: () => navigate("/") });
  const index = settingSteps.indexOf(current as (typeof settingSteps)[number]);

  return (
    <>
      <PageHeader
        title="Set up your workshop"
        eyebrow={workshop.data.name}
        description="A few settings so the programme and bookings fit how you work. Skip any step and come back to it later."
      />
      <FormError message={update.isError ? errorMessage(update.error) : null} />
      <nav aria-label="Set-up steps" className="mb-4">
        <ol className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
          {setupSteps.map((s, i) => (
            <li key={s}>
              <button
                type="button"
                className={
                  s === current
                    ? "font-semibold text-ink underline underline-offset-4"
                    : "text-accent underline-offset-2 hover:underline"
                }
                aria-current={s === current ? "step" : undefined}
                onClick={() => setStep(s)}
              >
                {i + 1}. {stepTitles[s]}
              </button>
            </li>
          ))}
        </ol>
      </nav>
      {current !== "next" ? (
        <Section
          title={`Step ${index + 1} of ${settingSteps.length}: ${stepTitles[current]}`}
          id="setup-step"
          description={stepHints[current]}
        >
          <SettingsForm
            key={current}
            workshop={workshop.data}
            groups={[current as SettingsGroup]}
            submitLabel="Save and continue"
            extraBody={{ setupStep: after(current) }}
            onSaved={() => setStep(after(current))}
            actions={
              <>
                <Button
                  variant="secondary"
                  onClick={() => goTo(after(current))}
                  disabled={update.isPending}
                >
                  Skip this step
                </Button>
                <LinkButton to="/" variant="quiet">
                  Leave set-up for now
                </LinkButton>
              </>
            }
          />
        </Section>
      ) : (
        <Section
          title="Next steps"
          id="setup-next"
          description="Bring in the people you work with, then start your first job."
        >
          <div className="flex flex-col gap-4">
            <ol className="flex flex-col gap-3">
              <li className="flex flex-wrap items-center justify-between gap-2 rounded border border-rule px-3 py-3">
                <div>
                  <p className="font-medium">Add your trades</p>
                  <p className="text-sm text-ink-soft">
                    The plasterers, electricians and decorators you book.
                  </p>
                </div>
                <LinkButton to="/trades" variant="secondary">
                  Add your trades
                </LinkButton>
              </li>
              <li className="flex flex-col gap-3 rounded border border-rule px-3 py-3">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <div>
                    <p className="font-medium">Add a customer</p>
                    <p className="text-sm text-ink-soft">
                      The householder whose room you are fitting.
                    </p>
                  </div>
                  {!addingCustomer ? (
                    <Button
                      variant="secondary"
                      onClick={() => setAddingCustomer(true)}
                    >
                      Add a customer
                    </Button>
                  ) : null}
                </div>
                {customerAdded ? <Notice>{customerAdded} added.</Notice> : null}
                {addingCustomer ? (
                  <AddCustomerForm
                    workshopId={workshopId}
                    onCreated={(c) => {
                      setCustomerAdded(c.name);
                      setAddingCustomer(false);
                    }}
                    onCancel={() => setAddingCustomer(false)}
                  />
                ) : null}
              </li>
              <li className="flex flex-wrap items-center justify-between gap-2 rounded border border-rule px-3 py-3">
                <div>
                  <p className="font-medium">
                    Start your first job from a starter
                  </p>
                  <p className="text-sm text-ink-soft">
                    {starterNames ? `Your starters: ${starterNames}. ` : ""}
                    The tasks come ready, dated from your first free day.
                  </p>
                </div>
                <LinkButton to="/?new=job" variant="secondary">
                  Start a job
                </LinkButton>
              </li>
            </ol>
            <div>
              <Button onClick={finish} disabled={update.isPending}>
                Finish setting up
              </Button>
            </div>
          </div>
        </Section>
      )}
    </>
  );
}
