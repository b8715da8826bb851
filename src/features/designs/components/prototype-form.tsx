import { TextField } from "@/components/ui/text-field";
import type { PrototypeResult, PrototypeText } from "@/features/designs/lib/prototype-spec";
import { SelectField } from "@/features/designs/components/select-field";

const FAMILIES = [["butterworth", "Butterworth"], ["chebyshev", "Chebyshev"], ["bessel", "Bessel"]] as const;
const TYPES = [["lowpass", "Low-pass"], ["highpass", "High-pass"], ["bandpass", "Band-pass"], ["bandstop", "Band-stop"]] as const;
const FIRST = [["shunt", "Shunt first"], ["series", "Series first"]] as const;
const FORMS = [["lowpass", "Low-pass (series L, shunt C)"], ["highpass", "High-pass (series C, shunt L)"]] as const;
const MODES = [["ladder", "Ladder filter"], ["lmatch", "L-section match"]] as const;

/** The prototype starter's inputs; the result (or the refused field) comes from synthesizeFromText. */
export function PrototypeForm({ value, onChange, result }: { value: PrototypeText; onChange: (next: PrototypeText) => void; result: PrototypeResult }) {
  const set = <K extends keyof PrototypeText>(key: K) => (v: PrototypeText[K]) => onChange({ ...value, [key]: v });
  const text = (key: keyof PrototypeText, label: string, hint?: string) => (
    <TextField
      label={label}
      hint={hint}
      value={value[key]}
      onChange={(e) => set(key)(e.target.value as never)}
      error={!result.ok && result.field === key ? result.message : undefined}
    />
  );
  const band = value.type === "bandpass" || value.type === "bandstop";
  return (
    <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
      <SelectField label="Starting point" value={value.mode} options={MODES} onChange={set("mode")} />
      {value.mode === "ladder" ? (
        <>
          <SelectField label="Family" value={value.family} options={FAMILIES} onChange={set("family")} />
          <SelectField label="Response" value={value.type} options={TYPES} onChange={set("type")} />
          {text("order", "Order", "1–12 reactive parts (per arm for band filters)")}
          {band ? (
            <>
              {text("low", "Lower edge (Hz)")}
              {text("high", "Upper edge (Hz)")}
            </>
          ) : (
            text("cutoff", "Cutoff (Hz)", value.family === "chebyshev" ? "The ripple band edge" : "The −3 dB frequency")
          )}
          {value.family === "chebyshev" && text("rippleDb", "Ripple (dB)", "0.001–6 dB")}
          {text("z0", "Terminations (Ω)")}
          <SelectField label="First arm" value={value.first} options={FIRST} onChange={set("first")} />
        </>
      ) : (
        <>
          {text("sourceR", "Source resistance (Ω)")}
          {text("loadR", "Load resistance (Ω)")}
          {text("freq", "Match frequency (Hz)")}
          <SelectField label="Form" value={value.form} options={FORMS} onChange={set("form")} />
        </>
      )}
    </div>
  );
}
