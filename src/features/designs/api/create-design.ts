import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { DesignView, Revision } from "@shared/contracts";
import { createDesignSchema, type CreateDesignInput } from "@shared/schemas/design";
import { api, checkBody } from "@/lib/api-client";
import { designKeys } from "@/features/designs/api/keys";

export type { CreateDesignInput };

export function createDesign(input: CreateDesignInput): Promise<{ design: DesignView; revision: Revision }> {
  return api.post<{ design: DesignView; revision: Revision }>("/designs", checkBody(createDesignSchema, input));
}

/** Creates a design with its first revision (designer). 400 names `netlist.parts[k].field`. */
export function useCreateDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createDesign,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: designKeys.lists() }),
  });
}
