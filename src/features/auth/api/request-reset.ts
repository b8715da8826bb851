import { useMutation } from "@tanstack/react-query";
import type { RequestResetInput } from "@shared/schemas/auth";
import { api } from "@/lib/api-client";

export { requestResetSchema } from "@shared/schemas/auth";

/** Asks for a reset mail. The answer is the same whether or not the account exists. */
export async function requestReset(input: RequestResetInput): Promise<{ ok: true }> {
  return api.post<{ ok: true }>("/auth/request-reset", input);
}

export function useRequestReset() {
  return useMutation({ mutationFn: requestReset });
}
