"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { BUFFERS, BUFFER_IDS, EC_STANDARD_IDS, EC_STANDARD_LABELS, readBufferTableRows, type BufferTableRow } from "@/lib/calibration";
import { cn } from "@/components/ui/cn";
import { ApiRefusal, api } from "./api";
import { KIND_LABEL } from "@/components/calibration/probe-options";
import { BufferTableEditor, CERTIFICATE_TABLE, newBufferTableRows } from "./buffer-table-editor";

export interface StartProbe {
  id: number;
  kind: "ph" | "ec";
  serial: string;
  statusLabel: string;
}

const SLOT_NAMES = ["First buffer", "Second buffer", "Third buffer"];
const select = "h-12 w-full rounded-md border border-paper-line bg-paper-raised px-3 text-base";
/** A common hydroponic conductivity standard, 2.77 mS/cm (common practice), kept at full value. */
const HYDRO_STANDARD = JSON.stringify({ ec25UsPerCm: 2770, alphaPerC: 0.019 });

export function StartRunForm({ tankId, probes, initialProbeId, maxHoldMinutes }: { tankId: number; probes: StartProbe[]; initialProbeId?: number; maxHoldMinutes: number }) {
  const router = useRouter();
  const [probeId, setProbeId] = useState(initialProbeId ?? probes[0]?.id);
  const probe = probes.find((p) => p.id === probeId);
  const [buffers, setBuffers] = useState<string[]>(["tech-7.00", "tech-4.01", ""]);
  // Certificate tables, one per buffer slot, used when that slot's picker says so.
  const [tables, setTables] = useState<BufferTableRow[][]>(() => buffers.map(newBufferTableRows));
  const [tableErrors, setTableErrors] = useState<Record<string, string>[]>([{}, {}, {}]);
  const [ecStandard, setEcStandard] = useState<string>("kcl-0.01M");
  const [minutes, setMinutes] = useState(30);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const start = async () => {
    if (!probe) return;
    setError(null);
    let standards: string[] = [ecStandard];
    if (probe.kind === "ph") {
      const checks = buffers.map((b, i) => (b === CERTIFICATE_TABLE ? readBufferTableRows(tables[i]) : null));
      setTableErrors(checks.map((c) => (c && !c.ok ? c.fields : {})));
      const bad = checks.findIndex((c) => c && !c.ok);
      if (bad >= 0) {
        const c = checks[bad];
        setError(`${SLOT_NAMES[bad]}: ${c && !c.ok ? c.message : ""}`);
        return;
      }
      standards = buffers.map((b, i) => (b === CERTIFICATE_TABLE ? (checks[i] as { text: string }).text : b)).filter(Boolean);
    }
    setBusy(true);
    try {
      const r = await api<{ runId: number; resumed: boolean; dosing: { status: string; message: string } | null }>("/api/calibrations/runs", {
        method: "POST",
        json: { tankId, probeId: probe.id, standards, holdMinutes: minutes },
      });
      if (r.resumed) toast.info("A run was already in progress on this probe: resuming it.");
      if (r.dosing?.status === "failed") toast.warning(r.dosing.message, { duration: 15_000 });
      router.push(`/calibrations/runs/${r.runId}`);
    } catch (e) {
      if (e instanceof ApiRefusal) {
        // A table the server refused: show its message under that buffer's table too.
        setTableErrors(buffers.map((_, i): Record<string, string> => (e.fields[`standards.${i}`] ? { _: e.fields[`standards.${i}`] } : {})));
      }
      setError(e instanceof ApiRefusal ? e.message : "The run could not start.");
      setBusy(false);
    }
  };

  return (
    <div className="space-y-5">
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Probe</legend>
        <div className="grid gap-2 sm:grid-cols-2">
          {probes.map((p) => (
            <label key={p.id} className={cn("flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border p-3", p.id === probeId ? "border-accent-600 bg-accent-50 ring-1 ring-accent-600" : "border-paper-line")}>
              <input type="radio" name="probe" className="size-5" checked={p.id === probeId} onChange={() => setProbeId(p.id)} />
              <span>
                <span className="font-semibold">{KIND_LABEL[p.kind]}</span> <code className="font-mono text-sm">{p.serial}</code>
                <span className="block text-xs text-ink-soft">{p.statusLabel}</span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      {probe?.kind === "ph" ? (
        <fieldset className="space-y-2">
          <legend className="mb-1 text-sm font-semibold">Buffers, in order (neutral first is common practice)</legend>
          {buffers.map((b, i) => (
            <div key={i}>
              <label className="block text-sm">
                {i === 2 ? "Third buffer (optional)" : SLOT_NAMES[i]}
                <select className={select} value={b} onChange={(e) => setBuffers(buffers.map((x, j) => (j === i ? e.target.value : x)))}>
                  {i > 0 ? <option value="">{i === 1 ? "None (one-point: offset only)" : "None"}</option> : null}
                  {BUFFER_IDS.map((id) => (
                    <option key={id} value={id}>
                      {BUFFERS[id].label}
                    </option>
                  ))}
                  <option value={CERTIFICATE_TABLE}>Own table from a certificate</option>
                </select>
              </label>
              {b === CERTIFICATE_TABLE ? (
                <BufferTableEditor name={SLOT_NAMES[i]} rows={tables[i]} errors={tableErrors[i]} onChange={(rows) => setTables(tables.map((t, j) => (j === i ? rows : t)))} />
              ) : null}
            </div>
          ))}
        </fieldset>
      ) : probe?.kind === "ec" ? (
        <label className="block text-sm font-semibold">
          Conductivity standard
          <select className={select} value={ecStandard} onChange={(e) => setEcStandard(e.target.value)}>
            {EC_STANDARD_IDS.map((id) => (
              <option key={id} value={id}>
                {EC_STANDARD_LABELS[id]}
              </option>
            ))}
            <option value={HYDRO_STANDARD}>Hydroponic standard 2.77 mS/cm (α 0.019 /°C)</option>
          </select>
        </label>
      ) : null}
      <label className="block max-w-xs text-sm font-semibold">
        Planned length of the hold (minutes)
        <input className={select} type="number" min={5} max={maxHoldMinutes} value={minutes} onChange={(e) => setMinutes(Number(e.target.value))} />
        <span className="text-xs font-normal text-ink-soft">The tank goes on hold unless it already is: no alerts, dosing inhibited.</span>
      </label>
      {error ? (
        <p role="alert" className="rounded-md border border-bad/40 bg-bad/5 p-3 text-sm font-medium text-bad">
          {error}
        </p>
      ) : null}
      <Button size="lg" onClick={start} disabled={!probe || busy}>
        {busy ? "Starting…" : "Start the calibration run"}
      </Button>
    </div>
  );
}
