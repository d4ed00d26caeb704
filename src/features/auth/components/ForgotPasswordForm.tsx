import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { passwordResetBodySchema } from "../../../../shared/schemas";
import { Button, FormError, Notice, TextField } from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { useRequestPasswordReset } from "../api/request-password-reset";

type Input = z.input<typeof passwordResetBodySchema>;
type Output = z.output<typeof passwordResetBodySchema>;

export function ForgotPasswordForm() {
  const request = useRequestPasswordReset();
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(passwordResetBodySchema),
    defaultValues: { email: "" },
  });
  const { errors } = form.formState;

  if (request.isSuccess) {
    // The same words whether or not the address has an account, so the page reveals nothing.
    return (
      <Notice>
        If an account exists for <strong>{request.variables.email}</strong>,
        we've sent a link to set a new password. It works once and expires soon;
        check your spam folder if it hasn't arrived in a few minutes.
      </Notice>
    );
  }

  const formError = request.isError
    ? applyServerErrors(request.error, form.setError, ["email"])
    : null;
  return (
    <form
      onSubmit={form.handleSubmit((body) => request.mutate(body))}
      noValidate
      className="flex flex-col gap-4"
    >
      <FormError message={formError} />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="email"
        inputMode="email"
        autoFocus
        error={errors.email?.message}
        {...form.register("email")}
      />
      <Button type="submit" busy={request.isPending} className="w-full">
        Send reset link
      </Button>
    </form>
  );
}
