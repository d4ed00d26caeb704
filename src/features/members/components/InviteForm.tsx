import { zodResolver } from "@hookform/resolvers/zod";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import {
  createInvitationBodySchema,
  type CustomerResponse,
  type InvitationResponse,
  type TradeResponse,
} from "../../../../shared/schemas";
import { Button, FormError, Select, TextField } from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { partyLabels } from "../../../lib/labels";
import { useCreateInvitation } from "../api/create-invitation";

type Input = z.input<typeof createInvitationBodySchema>;
type Output = z.output<typeof createInvitationBodySchema>;

interface InviteFormProps {
  workshopId: string;
  trades: TradeResponse[] | undefined;
  customers: CustomerResponse[] | undefined;
  /** Why the trade or customer lists are missing, if they failed to load. */
  listsError: string | null;
  onInvited: (invitation: InvitationResponse) => void;
}

export function InviteForm({
  workshopId,
  trades,
  customers,
  listsError,
  onInvited,
}: InviteFormProps) {
  const invite = useCreateInvitation(workshopId);
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(createInvitationBodySchema),
    defaultValues: {
      role: "fitter",
      name: "",
      email: "",
      tradeId: undefined,
      customerId: undefined,
    },
  });
  const { errors } = form.formState;
  const role = useWatch({ control: form.control, name: "role" });
  const formError = invite.isError
    ? applyServerErrors(invite.error, form.setError, [
        "role",
        "name",
        "email",
        "tradeId",
        "customerId",
      ])
    : null;

  // Choosing the record fills in who to invite from it; both stay editable.
  const fillFrom = (name: string, email: string) => {
    if (!form.getValues("name")) form.setValue("name", name);
    if (!form.getValues("email")) form.setValue("email", email);
  };

  const onSubmit = form.handleSubmit((body) => {
    // Only the record that matches the role goes to the server.
    const clean: Output = {
      role: body.role,
      name: body.name,
      email: body.email,
      ...(body.role === "trade" ? { tradeId: body.tradeId } : {}),
      ...(body.role === "customer" ? { customerId: body.customerId } : {}),
    };
    invite.mutate(clean, {
      onSuccess: (inv) => {
        form.reset({
          role: body.role,
          name: "",
          email: "",
          tradeId: undefined,
          customerId: undefined,
        });
        onInvited(inv);
      },
    });
  });

  const emptyToUndefined = {
    setValueAs: (v: unknown) => (v === "" ? undefined : v),
  };

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Invite someone"
      className="grid gap-4 md:grid-cols-2"
    >
      <FormError className="md:col-span-2" message={formError} />
      <Select
        label="They join as"
        error={errors.role?.message}
        {...form.register("role")}
      >
        <option value="fitter">Fitter (workshop staff)</option>
        <option value="trade">Trade</option>
        <option value="customer">Customer</option>
      </Select>
      {role === "trade" ? (
        <Select
          label="Trade they speak for"
          error={errors.tradeId?.message ?? listsError ?? undefined}
          {...form.register("tradeId", {
            ...emptyToUndefined,
            onChange: (e: React.ChangeEvent<HTMLSelectElement>) => {
              const t = trades?.find((x) => x.id === e.target.value);
              if (t) fillFrom(t.contactName, t.email);
            },
          })}
        >
          <option value="">Choose a trade</option>
          {(trades ?? []).map((t) => (
            <option key={t.id} value={t.id}>
              {t.businessName} ({partyLabels[t.kind]})
            </option>
          ))}
        </Select>
      ) : role === "customer" ? (
        <Select
          label="Customer"
          error={errors.customerId?.message ?? listsError ?? undefined}
          {...form.register("customerId", {
            ...emptyToUndefined,
            onChange: (e: React.ChangeEvent<HTMLSelectElement>) => {
              const c = customers?.find((x) => x.id === e.target.value);
              if (c) fillFrom(c.name, c.email);
            },
          })}
        >
          <option value="">Choose a customer</option>
          {(customers ?? []).map((c) => (
            <option key={c.id} value={c.id}>
              {c.name} ({c.email})
            </option>
          ))}
        </Select>
      ) : (
        <div aria-hidden="true" className="max-md:hidden" />
      )}
      <TextField
        label="Name"
        autoComplete="off"
        error={errors.name?.message}
        {...form.register("name")}
      />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="off"
        error={errors.email?.message}
        {...form.register("email")}
      />
      <div className="md:col-span-2">
        <Button type="submit" busy={invite.isPending}>
          Send invitation
        </Button>
        <p className="mt-2 text-sm text-ink-soft">
          They get an e-mail with a link to set their password. The link works
          once.
        </p>
      </div>
    </form>
  );
}
