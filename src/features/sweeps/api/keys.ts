/** Query keys of grade sweeps (the sweeps feature owns them; their runs are the runs feature's). */
export const sweepKeys = {
  all: ["sweeps"] as const,
  detail: (sweepId: string) => [...sweepKeys.all, sweepId] as const,
};
