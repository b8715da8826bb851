/**
 * A zod issue path in the engine's notation, the one every Lotwise error uses for `fields`:
 * ["netlist", "parts", 2, "value"] → "netlist.parts[2].value".
 */
export function fieldPath(path: readonly PropertyKey[]): string {
  return path.reduce<string>((acc, key) => (typeof key === "number" ? `${acc}[${key}]` : acc ? `${acc}.${String(key)}` : String(key)), "");
}
