import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router-dom";
import type { z } from "zod";
import { passwordHint, signUpBodySchema } from "../../../../shared/schemas";
import { Button, FormError, TextField } from "../../../components/ui";
import { isApiError } from "../../../lib/api-client";
import { applyServerErrors } from "../../../lib/form-errors";
import { useSignUp } from "../api/sign-up";

type Input = z.input<typeof signUpBodySchema>;
type Output = z.output<typeof signUpBodySchema>;

/** "Create your workshop": the shared schema checks the fields, the server the password list. */
export function SignUpForm({ onSignedUp }: { onSignedUp: () => void }) {
  const signUp = useSignUp();
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(signUpBodySchema),
    defaultValues: { workshopName: "", name: "", email: "", password: "" },
  });
  const { errors } = form.formState;
  // Server field errors go onto the fields once, when the answer comes (not during render).
  const [formError, setFormError] = useState<string | null>(null);

  const onSubmit = form.handleSubmit((body) => {
    setFormError(null);
    signUp.mutate(body, {
      onSuccess: onSignedUp,
      onError: (error) =>
        setFormError(
          isApiError(error) && error.status === 429
            ? error.message
            : applyServerErrors(error, form.setError, [
                "workshopName",
                "name",
                "email",
                "password",
              ]),
        ),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <FormError message={formError} />
      <TextField
        label="Workshop name"
        autoComplete="organization"
        autoFocus
        error={errors.workshopName?.message}
        {...form.register("workshopName")}
      />
      <TextField
        label="Your name"
        autoComplete="name"
        error={errors.name?.message}
        {...form.register("name")}
      />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        inputMode="email"
        hint="We send a link to confirm it. Until then Sitecue e-mails nobody for you."
        error={errors.email?.message}
        {...form.register("email")}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={passwordHint}
        error={errors.password?.message}
        {...form.register("password")}
      />
      <Button type="submit" busy={signUp.isPending} className="w-full">
        Create your workshop
      </Button>
      <p className="text-sm">
        <Link
          to="/sign-in"
          className="text-accent underline underline-offset-2"
        >
          Already on Sitecue? Sign in
        </Link>
      </p>
    </form>
  );
}
