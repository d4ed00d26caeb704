import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { Link } from "react-router-dom";
import type { z } from "zod";
import { signInBodySchema } from "../../../../shared/schemas";
import { Button, FormError, TextField } from "../../../components/ui";
import { isApiError } from "../../../lib/api-client";
import { applyServerErrors } from "../../../lib/form-errors";
import { useSignIn } from "../api/sign-in";

type Input = z.input<typeof signInBodySchema>;
type Output = z.output<typeof signInBodySchema>;

function signInErrorMessage(
  error: unknown,
  setError: Parameters<typeof applyServerErrors<Input>>[1],
) {
  if (isApiError(error) && error.code === "invalid-credentials") {
    return "That e-mail and password don't match an account. Check both, or reset your password.";
  }
  if (isApiError(error) && error.status === 429) {
    return (
      error.message ||
      "Too many attempts. Wait a few minutes before trying again."
    );
  }
  return applyServerErrors(error, setError, ["email", "password"]);
}

export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const signIn = useSignIn();
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(signInBodySchema),
    defaultValues: { email: "", password: "" },
  });
  const { errors } = form.formState;
  const formError = signIn.isError
    ? signInErrorMessage(signIn.error, form.setError)
    : null;

  const onSubmit = form.handleSubmit((body) =>
    signIn.mutate(body, { onSuccess: onSignedIn }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <FormError message={formError} />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        inputMode="email"
        autoFocus
        error={errors.email?.message}
        {...form.register("email")}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...form.register("password")}
      />
      <Button type="submit" busy={signIn.isPending} className="w-full">
        Sign in
      </Button>
      <p className="text-sm">
        <Link
          to="/forgot-password"
          className="text-accent underline underline-offset-2"
        >
          Forgotten your password?
        </Link>
      </p>
      <p className="border-t border-rule pt-4 text-sm">
        New to Sitecue?{" "}
        <Link
          to="/sign-up"
          className="text-accent underline underline-offset-2"
        >
          Create your workshop
        </Link>
      </p>
    </form>
  );
}
