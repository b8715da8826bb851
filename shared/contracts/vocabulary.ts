/**
 * The words client and server share: run states, review states, stress classes, part kinds, distributions.
 * Entities, schemas, presenters and screens all take them from here (never a copy).
 */

/** A run's life: queued → running → done | failed | cancelled. */
export const RUN_STATES = ["queued", "running", "done", "failed", "cancelled"] as const;
export type RunState = (typeof RUN_STATES)[number];

/** States a run never leaves. */
export const FINISHED_RUN_STATES: readonly RunState[] = ["done", "failed", "cancelled"];

export function isFinishedRunState(state: RunState): boolean {
  return FINISHED_RUN_STATES.includes(state);
}

/**
 * A revision's sign-off, in hardware release terms: draft → awaiting-signoff (the designer submits it) → signed-off |
 * returned (a reviewer signs it off or returns it for rework); returned → awaiting-signoff again on a new submission.
 */
export const REVIEW_STATES = ["draft", "awaiting-signoff", "signed-off", "returned"] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

/** What a person may do to a revision's review (who may do which is in ./access.ts). */
export const REVIEW_ACTIONS = ["submit", "sign-off", "return"] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

/** The badge tone of each review state (the client's Badge tones). */
export const REVIEW_STATE_TONE = { draft: "muted", "awaiting-signoff": "signal", "signed-off": "pass", returned: "fault" } as const satisfies Record<
  ReviewState,
  string
>;

/** Each review state in words, as the screens and mails say it. */
export const REVIEW_STATE_WORDS: Record<ReviewState, string> = {
  draft: "draft",
  "awaiting-signoff": "awaiting sign-off",
  "signed-off": "signed off",
  returned: "returned for rework",
};

/** How the filter is used; mains and high-power RF get a safety caution beside every result. */
export const STRESS_CLASSES = ["small-signal", "mains", "high-power-rf"] as const;
export type StressClass = (typeof STRESS_CLASSES)[number];
export const DEFAULT_STRESS_CLASS: StressClass = "small-signal";

export const STRESS_LABELS: Record<StressClass, string> = {
  "small-signal": "Small signal",
  mains: "Mains-connected",
  "high-power-rf": "High-power RF",
};

/** Part kinds of a netlist and of the grade catalogue. */
export const PART_KINDS = ["R", "L", "C"] as const;

/** How a part's value is spread within its tolerance (normal: tolerance = 3σ, truncated). */
export const DISTRIBUTIONS = ["normal", "uniform"] as const;
export type Distribution = (typeof DISTRIBUTIONS)[number];

/** Longest grade code of the catalogue (e.g. "J", "C0G-1%"); a run's grade overrides name parts by these codes. */
export const MAX_GRADE_CODE_LENGTH = 40;
