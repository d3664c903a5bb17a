"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import Papa from "papaparse";
import { CircleCheck, TriangleAlert } from "lucide-react";
import { Button } from "@/components/ui/button";
import { ecToMicrosiemens, ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { ApiRefusal, api } from "./api";
import { toLocalInput, type ProbeOption } from "./probe-options";
import { FIELD_CLASS, ProbeSelect } from "./probe-select";

const field = FIELD_CLASS;

interface SpotResult {
  spotCheck: { difference: number | null; pastTolerance: boolean; tidewellValue: number | null };
  tolerance: number;
  kind: "ph" | "ec";
}

export function SpotCheckForm({ probes, initialProbeId, ecUnit, now }: { probes: ProbeOption[]; initialProbeId?: number; ecUnit: EcUnit; now: number }) {
  const router = useRouter();
  const [probeId, setProbeId] = useState(initialProbeId ?? probes[0]?.id);
  const probe = probes.find((p) => p.id === probeId);
  const [takenAt, setTakenAt] = useState(() => toLocalInput(now));
  const [value, setValue] = useState("");
  const [note, setNote] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [result, setResult] = useState<SpotResult | null>(null);
  const submit = async () => {
    if (!probe) return;
    setError(null);
    setResult(null);
    const v = Number(value.replace(",", "."));
    try {
      const r = await api<SpotResult>(`/api/probes/${probe.id}/spot-checks`, {
        method: "POST",
        json: { takenAt: new Date(takenAt).getTime(), meterValue: probe.kind === "ec" ? ecToMicrosiemens(v, ecUnit) : v, note: note || undefined },
      });
      setResult(r);
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiRefusal ? e.message : "The spot check could not be saved.");
    }
  };
  const unit = probe?.kind === "ec" ? ecUnitLabel(ecUnit) : "pH";
  return (
    <form
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <div className="grid gap-3 sm:grid-cols-3">
        <ProbeSelect probes={probes} value={probeId} onChange={setProbeId} />
        <label className="block text-sm font-medium">
          Taken at
          <input className={field} type="datetime-local" value={takenAt} onChange={(e) => setTakenAt(e.target.value)} />
        </label>
        <label className="block text-sm font-medium">
          Handheld meter reading ({unit})
          <input className={field} name="meterValue" inputMode="decimal" value={value} onChange={(e) => setValue(e.target.value)} required />
        </label>
      </div>
      <label className="block text-sm font-medium">
        Note (optional)
        <input className={field} value={note} onChange={(e) => setNote(e.target.value)} />
      </label>
      {error ? (
        <p role="alert" className="text-sm font-medium text-bad">
          {error}
        </p>
      ) : null}
      {result ? <SpotVerdict result={result} probeId={probe!.id} /> : null}
      <Button type="submit" size="lg">
        Compare with Tidewell
      </Button>
    </form>
  );
}

function SpotVerdict({ result, probeId }: { result: SpotResult; probeId: number }) {
  const s = result.spotCheck;
  const fmt = (v: number) => (result.kind === "ph" ? `${v.toFixed(2)} pH` : `${(v / 1000).toFixed(3)} mS/cm`);
  if (s.tidewellValue === null || s.difference === null) {
    return <p className="rounded-md bg-paper-sunk p-3 text-sm">Saved. Tidewell has no reading within ±2 minutes of that time to compare with.</p>;
  }
  return s.pastTolerance ? (
    <div data-testid="spot-verdict" data-past-tolerance="true" className="rounded-md border border-bad/50 bg-bad/5 p-3 text-sm">
      <p className="flex items-center gap-2 font-semibold text-bad">
        <TriangleAlert className="size-5" aria-hidden /> Differs by {fmt(Math.abs(s.difference))}, past the tank&apos;s tolerance of ±{fmt(result.tolerance)}: recalibrate this probe.
      </p>
      <Link className="mt-1 inline-block font-medium text-accent-700 underline" href={`/probes/${probeId}`}>
        Open the probe record
      </Link>
    </div>
  ) : (
    <p data-testid="spot-verdict" data-past-tolerance="false" className="flex items-center gap-2 rounded-md border border-ok/40 bg-ok/5 p-3 text-sm font-semibold text-ok">
      <CircleCheck className="size-5" aria-hidden /> Differs by {fmt(Math.abs(s.difference))}: within the tank&apos;s tolerance of ±{fmt(result.tolerance)}.
    </p>
  );
}

/** Imports a CSV of handheld readings; row errors are listed and nothing is imported until all are right. */
export function SpotCheckImport() {
  const router = useRouter();
  const [error, setError] = useState<ApiRefusal | null>(null);
  const [done, setDone] = useState<{ imported: number; pastTolerance: number } | null>(null);
  const [preview, setPreview] = useState<number | null>(null);
  const [csv, setCsv] = useState<string>("");
  const pick = async (file: File | undefined) => {
    setError(null);
    setDone(null);
    if (!file) return;
    const text = await file.text();
    setCsv(text);
    setPreview(Papa.parse(text.trim(), { header: true, skipEmptyLines: true }).data.length);
  };
  const submit = async () => {
    try {
      setDone(await api<{ imported: number; pastTolerance: number }>("/api/spot-checks/import", { method: "POST", json: { csv } }));
      setError(null);
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiRefusal ? e : new ApiRefusal("The file could not be imported.", 500));
    }
  };
  return (
    <div className="space-y-3">
      <p className="text-sm text-ink-soft">
        Columns: <code className="font-mono">probe</code> (serial), <code className="font-mono">taken_at</code> (for example 2026-12-01T14:05Z; UTC unless an offset is given),{" "}
        <code className="font-mono">value</code>, and optionally <code className="font-mono">unit</code> (pH, mS/cm or µS/cm; EC defaults to mS/cm) and <code className="font-mono">note</code>.
      </p>
      <input aria-label="CSV file" type="file" accept=".csv,text/csv" className="block w-full text-sm" onChange={(e) => void pick(e.target.files?.[0])} />
      {preview !== null ? <p className="text-sm">{preview} rows read from the file.</p> : null}
      <Button type="button" size="lg" variant="secondary" disabled={!csv} onClick={() => void submit()}>
        Import the readings
      </Button>
      {error ? (
        <div role="alert" data-testid="import-errors" className="rounded-md border border-bad/40 bg-bad/5 p-3 text-sm text-bad">
          <p className="font-semibold">{error.message}</p>
          <ul className="mt-1 list-disc pl-5">
            {Object.entries(error.fields).map(([row, msg]) => (
              <li key={row}>
                <span className="font-medium capitalize">{row}</span>: {msg}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {done ? (
        <p data-testid="import-done" className="rounded-md border border-ok/40 bg-ok/5 p-3 text-sm font-medium text-ok">
          Imported {done.imported} readings; {done.pastTolerance} past tolerance{done.pastTolerance ? " — those probes should be recalibrated" : ""}.
        </p>
      ) : null}
    </div>
  );
}
