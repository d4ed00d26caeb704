import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { passwordHint, passwordSchema } from "../../../../shared/schemas";
import { Button, FormError, TextField } from "../../../components/ui";
import { isApiError } from "../../../lib/api-client";
import { applyServerErrors } from "../../../lib/form-errors";
import { useSetPassword } from "../api/set-password";

// The shared rule for a password, plus the confirmation only a form needs.
const setPasswordFormSchema = z
  .object({
    password: passwordSchema,
    confirm: z.string().min(1, "Type the password again"),
  })
  .refine((v) => v.password === v.confirm, {
    message: "The two passwords differ",
    path: ["confirm"],
  });

type Input = z.input<typeof setPasswordFormSchema>;
type Output = z.output<typeof setPasswordFormSchema>;

interface SetPasswordFormProps {
  token: string;
  email: string;
  submitLabel: string;
  onDone: () => void;
}

export function SetPasswordForm({
  token,
  email,
  submitLabel,
  onDone,
}: SetPasswordFormProps) {
  const setPassword = useSetPassword();
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(setPasswordFormSchema),
    defaultValues: { password: "", confirm: "" },
  });
  const { errors } = form.formState;

  let formError: string | null = null;
  if (setPassword.isError) {
    formError =
      isApiError(setPassword.error) &&
      setPassword.error.code === "token-invalid"
        ? // The server says why: expired, used, or replaced by a newer link.
          setPassword.error.message
        : applyServerErrors(setPassword.error, form.setError, ["password"]);
  }

  const onSubmit = form.handleSubmit(({ password }) =>
    setPassword.mutate({ token, password }, { onSuccess: onDone }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <FormError message={formError} />
      {/* Lets password managers store the new password against the right account. */}
      <input
        type="email"
        name="username"
        autoComplete="username"
        value={email}
        readOnly
        hidden
      />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={passwordHint}
        error={errors.password?.message}
        {...form.register("password")}
      />
      <TextField
        label="Confirm password"
        type="password"
        autoComplete="new-password"
        error={errors.confirm?.message}
        {...form.register("confirm")}
      />
      <Button type="submit" busy={setPassword.isPending} className="w-full">
        {submitLabel}
      </Button>
    </form>
  );
}
