"use client";
import { useState } from "react";
import { Input } from "@/components/ui/input";
import type { ControlProps } from "@/components/ui/field";
import { ecDecimals, ecInUnit, type EcUnit } from "@/lib/display/units";
import { ecToMicrosiemens } from "@/lib/display/units";

/** An EC value typed in the user's unit; the form holds µS/cm, as stored. */
export function EcInput({ control, valueUs, unit, onChange, onBlur }: { control: ControlProps; valueUs: number; unit: EcUnit; onChange: (us: number) => void; onBlur: () => void }) {
  const shown = (us: number) => (Number.isFinite(us) ? String(Number(ecInUnit(us, unit).toFixed(ecDecimals(unit) + 2))) : "");
  const [text, setText] = useState(() => shown(valueUs));
  return (
    <Input
      {...control}
      type="number"
      inputMode="decimal"
      step="any"
      value={text}
      onBlur={onBlur}
      onChange={(e) => {
        setText(e.target.value);
        onChange(e.target.value === "" ? Number.NaN : ecToMicrosiemens(Number(e.target.value), unit));
      }}
    />
  );
}
