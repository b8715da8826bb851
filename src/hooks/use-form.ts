import { useState, type ChangeEvent } from "react";
import { splitApiError, type FieldErrors } from "@/lib/form";

/**
 * State for a small text form: values, field messages and one form-level message. Editing a
 * field clears its message, so a stale error never sits beside a corrected value.
 */
export function useForm<V extends Record<string, string>>(initial: V) {
  const [values, setValues] = useState<V>(initial);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);

  function bind(name: keyof V & string): { name: string; value: string; onChange: (event: ChangeEvent<HTMLInputElement>) => void } {
    return {
      name,
      value: values[name],
      onChange: (event: ChangeEvent<HTMLInputElement>) => {
        const value = event.target.value;
        setValues((current) => ({ ...current, [name]: value }));
        setErrors(({ [name]: _cleared, ...rest }) => rest);
      },
    };
  }

  function showErrors(fields: FieldErrors, message: string | null = null) {
    setErrors(fields);
    setFormError(message);
  }

  function showApiError(error: unknown) {
    const { fields, message } = splitApiError(error);
    showErrors(fields, message);
  }

  function reset() {
    setValues(initial);
    showErrors({});
  }

  return { values, errors, formError, bind, showErrors, showApiError, reset };
}
