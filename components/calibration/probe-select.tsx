import { KIND_LABEL, type ProbeOption } from "./probe-options";

export const FIELD_CLASS = "h-12 w-full rounded-md border border-paper-line bg-paper-raised px-3 text-base";

/** The probe picker of the calibration forms: tank, measure and serial in each option. */
export function ProbeSelect({ probes, value, onChange }: { probes: ProbeOption[]; value: number; onChange: (id: number) => void }) {
  return (
    <label className="block text-sm font-medium">
      Probe
      <select className={FIELD_CLASS} value={value} onChange={(e) => onChange(Number(e.target.value))}>
        {probes.map((p) => (
          <option key={p.id} value={p.id}>
            {p.tankName} · {KIND_LABEL[p.kind]} {p.serial}
          </option>
        ))}
      </select>
    </label>
  );
}
