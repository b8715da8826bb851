import { useState, type FormEvent } from "react";
import { ROLES, ROLE_PURPOSE, type Role } from "@shared/roles";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Checkbox } from "@/components/ui/checkbox";
import { TextField } from "@/components/ui/text-field";
import { useForm } from "@/hooks/use-form";
import { ApiError } from "@/lib/api-client";
import { phraseFieldError, validateWith } from "@/lib/form";
import { createInvitationSchema, useCreateInvitation } from "@/features/team/api/create-invitation";

/** Invite by e-mail with one or more roles. The mail carries a single-use, expiring link. */
export function InviteForm() {
  const form = useForm({ email: "" });
  const [roles, setRoles] = useState<Role[]>([]);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const create = useCreateInvitation();
  const rolesError = phraseFieldError("The invitation", form.errors.roles);

  function handleToggle(role: Role, checked: boolean) {
    setRoles((current) => (checked ? [...current, role] : current.filter((r) => r !== role)));
  }

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setSentTo(null);
    const parsed = validateWith(createInvitationSchema, { email: form.values.email, roles });
    if (!parsed.ok) return form.showErrors(parsed.errors);
    form.showErrors({});
    create.mutate(parsed.data, {
      onSuccess: (invitation) => {
        setSentTo(invitation.email);
        form.reset();
        setRoles([]);
      },
      onError: (error) => {
        if (error instanceof ApiError && error.code === "ALREADY_MEMBER") {
          form.showErrors({ email: error.message });
        } else {
          form.showApiError(error);
        }
      },
    });
  }

  return (
    <form noValidate onSubmit={handleSubmit} className="flex flex-col gap-4">
      <TextField
        label="E-mail"
        type="email"
        autoComplete="off"
        required
        {...form.bind("email")}
        error={phraseFieldError("E-mail", form.errors.email)}
      />
      <fieldset aria-describedby={rolesError ? "invite-roles-error" : undefined}>
        <legend className="text-sm font-semibold text-paper-200">Roles</legend>
        <div className="mt-2 flex flex-col gap-2.5">
          {ROLES.map((role) => (
            <Checkbox
              key={role}
              label={role}
              description={ROLE_PURPOSE[role]}
              checked={roles.includes(role)}
              onChange={(event) => handleToggle(role, event.target.checked)}
            />
          ))}
        </div>
        {rolesError && (
          <p id="invite-roles-error" className="mt-2 text-xs font-semibold text-fault-300">
            {rolesError}
          </p>
        )}
      </fieldset>
      {form.formError && <Alert tone="error">{form.formError}</Alert>}
      {sentTo && (
        <Alert tone="success">
          Invitation sent to <span className="font-mono">{sentTo}</span>.
        </Alert>
      )}
      <Button type="submit" pending={create.isPending}>
        Send invitation
      </Button>
    </form>
  );
}
