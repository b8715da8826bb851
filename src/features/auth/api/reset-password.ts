import { useMutation } from "@tanstack/react-query";
import type { ResetPasswordInput } from "@shared/schemas/auth";
import { api } from "@/lib/api-client";

export { resetPasswordSchema } from "@shared/schemas/auth";

export async function resetPassword(input: ResetPasswordInput): Promise<{ ok: true }> {
  return api.post<{ ok: true }>("/auth/reset-password", input);
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
