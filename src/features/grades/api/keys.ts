/** Query keys of the grade catalogue (the grades feature owns it). */
export const gradeKeys = {
  all: ["grades"] as const,
};
