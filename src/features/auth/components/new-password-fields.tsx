import { TextField } from "@/components/ui/text-field";
import type { useForm } from "@/hooks/use-form";
import { phraseFieldError } from "@/lib/form";

type PasswordForm = ReturnType<typeof useForm<{ password: string; repeat: string }>>;

/** "Password" and "Repeat password", shared by the invitation and reset forms. */
export function NewPasswordFields({ form, label = "Password" }: { form: PasswordForm; label?: string }) {
  return (
    <>
      <TextField
        label={label}
        type="password"
        autoComplete="new-password"
        required
        hint="At least 12 characters. A few unrelated words make a strong one."
        {...form.bind("password")}
        error={phraseFieldError(label, form.errors.password)}
      />
      <TextField
        label="Repeat password"
        type="password"
        autoComplete="new-password"
        required
        {...form.bind("repeat")}
        error={phraseFieldError("Repeat password", form.errors.repeat)}
      />
    </>
  );
}

/** The message for the repeat field, when the two entries differ. */
export function checkRepeat(values: { password: string; repeat: string }): Record<string, string> {
  return values.repeat === values.password ? {} : { repeat: "Both passwords must match." };
}
