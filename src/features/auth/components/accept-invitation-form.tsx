import type { FormEvent } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { useForm } from "@/hooks/use-form";
import { phraseFieldError, validateWith } from "@/lib/form";
import { acceptInvitationSchema, useAcceptInvitation } from "@/features/auth/api/accept-invitation";
import type { AuthUserView as User } from "@shared/contracts";
import { checkRepeat, NewPasswordFields } from "@/features/auth/components/new-password-fields";

/** Name and password for a new account; on success the person is signed in. */
export function AcceptInvitationForm({ token, onSuccess }: { token: string; onSuccess: (user: User) => void }) {
  const form = useForm({ name: "", password: "", repeat: "" });
  const accept = useAcceptInvitation();

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const { repeat: _repeat, ...fields } = form.values;
    const parsed = validateWith(acceptInvitationSchema, { token, ...fields });
    const errors = { ...(parsed.ok ? {} : parsed.errors), ...checkRepeat(form.values) };
    if (errors.token) return form.showErrors({}, "This invitation link is incomplete. Copy the whole link from the mail.");
    if (!parsed.ok || Object.keys(errors).length > 0) return form.showErrors(errors);
    form.showErrors({});
    accept.mutate(parsed.data, { onSuccess, onError: form.showApiError });
  }

  return (
    <form noValidate onSubmit={handleSubmit} className="flex flex-col gap-4">
      <TextField
        label="Your name"
        autoComplete="name"
        autoFocus
        required
        {...form.bind("name")}
        error={phraseFieldError("Your name", form.errors.name)}
      />
      <NewPasswordFields form={form} />
      {form.formError && <Alert tone="error">{form.formError}</Alert>}
      <Button type="submit" pending={accept.isPending}>
        Create account
      </Button>
    </form>
  );
}
