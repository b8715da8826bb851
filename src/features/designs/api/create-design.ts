import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Netlist } from "@shared/engine/netlist";
import { api } from "@/lib/api-client";
import type { Design, Revision, StressClass, SweepSetting } from "@/features/designs/api/types";

export type CreateDesignInput = { name: string; description?: string; stress?: StressClass; netlist: Netlist; sweep?: SweepSetting };

export function createDesign(input: CreateDesignInput): Promise<{ design: Design; revision: Revision }> {
  return api.post<{ design: Design; revision: Revision }>("/designs", input);
}

/** Creates a design with its first revision (designer). 400 names `netlist.parts[k].field`. */
export function useCreateDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createDesign,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["designs"] }),
  });
}
