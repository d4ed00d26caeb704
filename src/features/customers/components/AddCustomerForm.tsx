import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import {
  customerBodySchema,
  type CustomerResponse,
} from "../../../../shared/schemas";
import { Button, FormError, TextField } from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { useCreateCustomer } from "../api/create-customer";

type Input = z.input<typeof customerBodySchema>;
type Output = z.output<typeof customerBodySchema>;

interface AddCustomerFormProps {
  workshopId: string;
  onCreated: (customer: CustomerResponse) => void;
  onCancel?: () => void;
}

export function AddCustomerForm({
  workshopId,
  onCreated,
  onCancel,
}: AddCustomerFormProps) {
  const create = useCreateCustomer(workshopId);
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(customerBodySchema),
    defaultValues: { name: "", email: "", phone: "" },
  });
  const { errors } = form.formState;
  const formError = create.isError
    ? applyServerErrors(create.error, form.setError, ["name", "email", "phone"])
    : null;

  const onSubmit = form.handleSubmit((body) =>
    create.mutate(body, { onSuccess: onCreated }),
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="New customer"
      className="grid gap-3 sm:grid-cols-3"
    >
      <p className="text-sm font-semibold sm:col-span-3">New customer</p>
      <FormError className="sm:col-span-3" message={formError} />
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
      <TextField
        label="Phone"
        type="tel"
        optional
        autoComplete="off"
        error={errors.phone?.message}
        // An empty box means "no phone", which the schema expresses as a missing field.
        {...form.register("phone", {
          setValueAs: (v: unknown) =>
            typeof v === "string" && v.trim() === "" ? undefined : v,
        })}
      />
      <div className="flex flex-wrap gap-2 sm:col-span-3">
        <Button type="submit" size="sm" busy={create.isPending}>
          Add customer
        </Button>
        {onCancel ? (
          <Button size="sm" variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
