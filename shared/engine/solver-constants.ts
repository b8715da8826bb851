/** Numerical constants of the Lotwise nodal solver (see solver-evaluate.ts for how they are used). */

/** Static pivot acceptance: |pivot|₁ > STATIC_PIVOT_TOL · (row admittance scale Σ|y|₁). */
export const STATIC_PIVOT_TOL = 1e-3;
/** Dense fallback: |pivot|₁ ≤ SINGULAR_TOL · (column admittance scale) means a singular nodal matrix. */
export const SINGULAR_TOL = 1e-13;
/** Frequencies per block of the vectorized loops. */
export const FREQ_BLOCK = 64;
