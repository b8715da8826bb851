import type { FormEvent } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { useForm } from "@/hooks/use-form";
import { phraseFieldError, validateWith } from "@/lib/form";
import { requestResetSchema, useRequestReset } from "@/features/auth/api/request-reset";

/** Asks for a reset link. The reply never says whether the address has an account. */
export function ForgotPasswordForm() {
  const form = useForm({ email: "" });
  const requestReset = useRequestReset();

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = validateWith(requestResetSchema, form.values);
    if (!parsed.ok) return form.showErrors(parsed.errors);
    form.showErrors({});
    requestReset.mutate(parsed.data, { onError: form.showApiError });
  }

  if (requestReset.isSuccess) {
    return (
      <Alert tone="success" title="Check your mail">
        If <span className="font-mono">{requestReset.variables.email}</span> belongs to a Lotwise
        account, a reset link is on its way. It works once and expires after a while.
      </Alert>
    );
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
      {form.formError && <Alert tone="error">{form.formError}</Alert>}
      <Button type="submit" pending={requestReset.isPending}>
        Send reset link
      </Button>
    </form>
  );
}
