import type { FormEvent } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextLink } from "@/components/ui/link";
import { paths } from "@/config/paths";
import { useForm } from "@/hooks/use-form";
import { validateWith } from "@/lib/form";
import { ApiError } from "@/lib/api-client";
import { resetPasswordSchema, useResetPassword } from "@/features/auth/api/reset-password";
import { checkRepeat, NewPasswordFields } from "@/features/auth/components/new-password-fields";

/** Sets a new password with the token from the reset mail. */
export function ResetPasswordForm({ token }: { token: string }) {
  const form = useForm({ password: "", repeat: "" });
  const resetPassword = useResetPassword();
  const tokenRejected =
    resetPassword.error instanceof ApiError && resetPassword.error.code === "TOKEN_INVALID";

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = validateWith(resetPasswordSchema, { token, password: form.values.password });
    const errors = { ...(parsed.ok ? {} : parsed.errors), ...checkRepeat(form.values) };
    if (errors.token) return form.showErrors({}, "This reset link is incomplete. Copy the whole link from the mail.");
    if (!parsed.ok || Object.keys(errors).length > 0) return form.showErrors(errors);
    form.showErrors({});
    resetPassword.mutate(parsed.data, { onError: form.showApiError });
  }

  if (resetPassword.isSuccess) {
    return (
      <Alert tone="success" title="Password changed">
        Sign in with the new password. <TextLink to={paths.auth.signIn.getHref()}>Go to sign-in</TextLink>
      </Alert>
    );
  }

  if (tokenRejected) {
    return (
      <Alert tone="error" title="This reset link cannot be used">
        It may have been used already, have expired, or be mistyped.{" "}
        <TextLink to={paths.auth.forgotPassword.getHref()}>Ask for a new link</TextLink>
      </Alert>
    );
  }

  return (
    <form noValidate onSubmit={handleSubmit} className="flex flex-col gap-4">
      <NewPasswordFields form={form} label="New password" />
      {form.formError && <Alert tone="error">{form.formError}</Alert>}
      <Button type="submit" pending={resetPassword.isPending}>
        Set new password
      </Button>
    </form>
  );
}
