import type { FormEvent } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextLink } from "@/components/ui/link";
import { TextField } from "@/components/ui/text-field";
import { paths } from "@/config/paths";
import { useForm } from "@/hooks/use-form";
import { phraseFieldError, validateWith } from "@/lib/form";
import { signInSchema, useSignIn } from "@/features/auth/api/sign-in";
import type { AuthUserView as User } from "@shared/contracts";

/** E-mail and password; Enter submits. Wrong credentials and rate limits show above the button. */
export function SignInForm({ onSuccess }: { onSuccess?: (user: User) => void }) {
  const form = useForm({ email: "", password: "" });
  const signIn = useSignIn();

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = validateWith(signInSchema, form.values);
    if (!parsed.ok) return form.showErrors(parsed.errors);
    form.showErrors({});
    signIn.mutate(parsed.data, { onSuccess, onError: form.showApiError });
  }

  return (
    <form noValidate onSubmit={handleSubmit} className="flex flex-col gap-4">
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        autoFocus
        required
        {...form.bind("email")}
        error={phraseFieldError("E-mail", form.errors.email)}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        required
        {...form.bind("password")}
        error={phraseFieldError("Password", form.errors.password)}
      />
      <div className="-mt-1 text-right text-sm">
        <TextLink to={paths.auth.forgotPassword.getHref()}>Forgot password?</TextLink>
      </div>
      {form.formError && <Alert tone="error">{form.formError}</Alert>}
      <Button type="submit" pending={signIn.isPending}>
        Sign in
      </Button>
    </form>
  );
}
