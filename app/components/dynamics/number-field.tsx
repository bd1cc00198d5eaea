// A labelled number input of the Dynamics panel's forms.
export function NumberField({ label, value, onChange, min, max }: { label: string; value: number; onChange: (v: number) => void; min?: number; max?: number }) {
  return (
    <label className="text-sm">
      <span className="label">{label}</span>
      <input className="field w-28 py-1.5" type="number" step="any" min={min} max={max} value={value} onChange={(e) => onChange(Number(e.target.value))} required />
    </label>
  );
}
