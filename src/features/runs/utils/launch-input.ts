/** A random seed in 0..2³¹−1 from the browser's CSPRNG (shown and editable before launch). */
export function randomSeed(): number {
  const a = new Uint32Array(1);
  crypto.getRandomValues(a);
  return a[0] & 0x7fffffff;
}

/**
 * Reads temperature corners typed as "−40, 25, 85" (°C; commas, spaces or semicolons between; the Unicode
 * minus is accepted). Empty text means none (the engine runs at 25 °C).
 * @returns the corners, or an error message naming the first bad entry
 */
export function parseCorners(text: string): { corners?: number[]; error?: string } {
  const items = text.replace(/\u2212/g, "-").split(/[\s,;]+/).filter(Boolean);
  if (items.length === 0) return {};
  if (items.length > 10) return { error: "At most 10 corners." };
  const corners: number[] = [];
  for (const item of items) {
    const v = Number(item.replace(/°?c$/i, ""));
    if (!Number.isFinite(v) || v < -273.15 || v > 500) return { error: `“${item}” is not a temperature in °C.` };
    corners.push(v);
  }
  return { corners };
}

/** Checks a whole-number field within [min, max]; returns an error message or undefined. */
export function checkInteger(text: string, min: number, max: number, what: string): string | undefined {
  const v = Number(text);
  if (!/^\d+$/.test(text.trim()) || !Number.isSafeInteger(v)) return `${what} must be a whole number.`;
  if (v < min || v > max) return `${what} must be between ${min.toLocaleString()} and ${max.toLocaleString()}.`;
  return undefined;
}
