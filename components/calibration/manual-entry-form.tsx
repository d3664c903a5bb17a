"use client";
import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { BUFFERS, BUFFER_IDS, EC_STANDARD_IDS, EC_STANDARD_LABELS, readBufferTableRows, type BufferTableRow } from "@/lib/calibration";
import { ApiRefusal, api } from "./api";
import { toLocalInput, type ProbeOption } from "./probe-options";
import { FIELD_CLASS, ProbeSelect } from "./probe-select";
import { BufferTableEditor, CERTIFICATE_TABLE, newBufferTableRows } from "./buffer-table-editor";

const field = FIELD_CLASS;
const HYDRO_STANDARD = JSON.stringify({ ec25UsPerCm: 2770, alphaPerC: 0.019 });

interface StandardRow {
  standard: string;
  lot: string;
  expiresOn: string;
  tempC: string;
  /** The certificate table, when `standard` is CERTIFICATE_TABLE. */
  table: BufferTableRow[];
}

const newRow = (standard: string): StandardRow => ({ standard, lot: "", expiresOn: "", tempC: "", table: newBufferTableRows() });

export function ManualEntryForm({ probes, now }: { probes: ProbeOption[]; now: number }) {
  const [probeId, setProbeId] = useState(probes[0]?.id);
  const probe = probes.find((p) => p.id === probeId);
  const [performedAt, setPerformedAt] = useState(() => toLocalInput(now));
  const [slope, setSlope] = useState("");
  const [offset, setOffset] = useState("");
  const [cellK, setCellK] = useState("");
  const [rows, setRows] = useState<StandardRow[]>([newRow("tech-7.00")]);
  const [tableErrors, setTableErrors] = useState<Record<string, string>[]>([]);
  const [note, setNote] = useState("");
  const [file, setFile] = useState<File | null>(null);
  const [error, setError] = useState<ApiRefusal | null>(null);
  const [saved, setSaved] = useState<{ id: number; status: string; reasons: string[] } | null>(null);
  const [busy, setBusy] = useState(false);
  const options = probe?.kind === "ec" ? [...EC_STANDARD_IDS.map((id) => [id, EC_STANDARD_LABELS[id]] as const), [HYDRO_STANDARD, "Hydroponic standard 2.77 mS/cm"] as const] : BUFFER_IDS.map((id) => [id, BUFFERS[id].label] as const);

  const submit = async () => {
    if (!probe) return;
    setError(null);
    const checks = rows.map((r) => (probe.kind === "ph" && r.standard === CERTIFICATE_TABLE ? readBufferTableRows(r.table) : null));
    setTableErrors(checks.map((c) => (c && !c.ok ? c.fields : {})));
    const bad = checks.findIndex((c) => c && !c.ok);
    if (bad >= 0) {
      const c = checks[bad];
      setError(new ApiRefusal(`Buffer ${bad + 1}: ${c && !c.ok ? c.message : ""}`, 400));
      return;
    }
    const standardText = (r: StandardRow, i: number) => (probe.kind === "ph" && r.standard === CERTIFICATE_TABLE ? (checks[i] as { text: string }).text : r.standard);
    setBusy(true);
    try {
      let uploadId: number | undefined;
      if (file) {
        const form = new FormData();
        form.append("file", file);
        uploadId = (await api<{ upload: { id: number } }>("/api/uploads", { method: "POST", body: form })).upload.id;
      }
      const num = (s: string) => (s.trim() === "" ? undefined : Number(s.replace(",", ".")));
      const r = await api<{ run: { id: number; status: string; reasons: string[] } }>("/api/calibrations/manual", {
        method: "POST",
        json: {
          probeId: probe.id,
          performedAt: new Date(performedAt).getTime(),
          ...(probe.kind === "ph" ? { slopePct: num(slope), offsetMv: num(offset) } : { cellConstant: num(cellK) }),
          standards: rows.map((r, i) => ({ standard: standardText(r, i), lot: r.lot, expiresOn: r.expiresOn, tempC: num(r.tempC) })),
          note: note || undefined,
          uploadId,
        },
      });
      setSaved(r.run);
    } catch (e) {
      if (e instanceof ApiRefusal) setTableErrors(rows.map((_, i): Record<string, string> => (e.fields[`standards.${i}.standard`] ? { _: e.fields[`standards.${i}.standard`] } : {})));
      setError(e instanceof ApiRefusal ? e : new ApiRefusal("The calibration could not be saved.", 500));
    } finally {
      setBusy(false);
    }
  };

  if (saved && probe) {
    return (
      <div className="space-y-3" data-verdict={saved.status}>
        <p className={`text-lg font-semibold ${saved.status === "accepted" ? "text-ok" : "text-bad"}`}>{saved.status === "accepted" ? "✓ Recorded and accepted" : "✕ Recorded as rejected"}</p>
        <ul className="list-disc pl-5 text-sm">
          {saved.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
        <Link className="font-medium text-accent-700 underline" href={`/probes/${probe.id}`}>
          Open the probe record
        </Link>
      </div>
    );
  }

  return (
    <form
      className="space-y-5"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <div className="grid gap-3 sm:grid-cols-2">
        <ProbeSelect probes={probes} value={probeId} onChange={setProbeId} />
        <label className="block text-sm font-medium">
          Calibrated at
          <input className={field} type="datetime-local" value={performedAt} onChange={(e) => setPerformedAt(e.target.value)} />
          {error?.fields.performedAt ? <span className="text-xs text-bad">{error.fields.performedAt}</span> : null}
        </label>
      </div>
      {probe?.kind === "ph" ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <label className="block text-sm font-medium">
            Slope (%)
            <input className={field} inputMode="decimal" name="slopePct" value={slope} onChange={(e) => setSlope(e.target.value)} />
          </label>
          <label className="block text-sm font-medium">
            Offset (mV)
            <input className={field} inputMode="decimal" name="offsetMv" value={offset} onChange={(e) => setOffset(e.target.value)} />
          </label>
        </div>
      ) : (
        <label className="block max-w-xs text-sm font-medium">
          Cell constant (/cm)
          <input className={field} inputMode="decimal" name="cellConstant" value={cellK} onChange={(e) => setCellK(e.target.value)} />
        </label>
      )}
      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">{probe?.kind === "ec" ? "Standard used" : "Buffers used"}, with their lots</legend>
        {rows.map((r, i) => (
          <div key={i} className="grid gap-2 rounded-md border border-paper-line p-3 sm:grid-cols-[2fr_1fr_1fr_6rem]" data-standard-row={i}>
            <select aria-label="Buffer or standard" className={field} value={r.standard} onChange={(e) => setRows(rows.map((x, j) => (j === i ? { ...x, standard: e.target.value } : x)))}>
              {options.map(([id, label]) => (
                <option key={id} value={id}>
                  {label}
                </option>
              ))}
              {probe?.kind === "ph" ? <option value={CERTIFICATE_TABLE}>Own table from a certificate</option> : null}
            </select>
            <input aria-label="Lot" placeholder="Lot" className={field} value={r.lot} onChange={(e) => setRows(rows.map((x, j) => (j === i ? { ...x, lot: e.target.value } : x)))} />
            <input aria-label="Expiry date" type="date" className={field} value={r.expiresOn} onChange={(e) => setRows(rows.map((x, j) => (j === i ? { ...x, expiresOn: e.target.value } : x)))} />
            <input aria-label="Temperature °C" placeholder="°C" inputMode="decimal" className={field} value={r.tempC} onChange={(e) => setRows(rows.map((x, j) => (j === i ? { ...x, tempC: e.target.value } : x)))} />
            {probe?.kind === "ph" && r.standard === CERTIFICATE_TABLE ? (
              <div className="sm:col-span-4">
                <BufferTableEditor name={`Buffer ${i + 1}`} rows={r.table} errors={tableErrors[i]} onChange={(table) => setRows(rows.map((x, j) => (j === i ? { ...x, table } : x)))} />
              </div>
            ) : null}
          </div>
        ))}
        {probe?.kind === "ph" && rows.length < 3 ? (
          <Button type="button" variant="secondary" size="sm" onClick={() => setRows([...rows, newRow(rows.length === 1 ? "tech-4.01" : "tech-10.01")])}>
            Add a buffer
          </Button>
        ) : null}
      </fieldset>
      <label className="block text-sm font-medium">
        Buffer certificate or photo of the meter&apos;s record (PDF, PNG or JPEG, up to 5 MB)
        <input className="mt-1 block w-full text-sm" type="file" accept="application/pdf,image/png,image/jpeg" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
      </label>
      <label className="block text-sm font-medium">
        Note (who calibrated, with which meter)
        <input className={field} value={note} onChange={(e) => setNote(e.target.value)} />
      </label>
      {error ? (
        <div role="alert" className="rounded-md border border-bad/40 bg-bad/5 p-3 text-sm font-medium text-bad">
          {error.message}
        </div>
      ) : null}
      <Button type="submit" size="lg" disabled={busy || !probe}>
        {busy ? "Saving…" : "Save the calibration record"}
      </Button>
    </form>
  );
}
