"use client";
// Correcting or deleting a spot check entered in error (growers and owners). Both are audited on
// the server with the values before; the page re-reads the table afterwards.
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Pencil, Trash2 } from "lucide-react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { Dialog } from "@/components/ui/dialog";
import { ecInUnit, ecToMicrosiemens, ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { formatDateTime } from "@/lib/display/time";
import { ApiRefusal, api } from "./api";
import { toLocalInput } from "./probe-options";
import { FIELD_CLASS } from "./probe-select";

export interface SpotCheckRowJson {
  id: number;
  takenAt: number;
  meterValue: number;
  note: string | null;
}

export function SpotCheckRowActions({ row, kind, ecUnit }: { row: SpotCheckRowJson; kind: "ph" | "ec"; ecUnit: EcUnit }) {
  const router = useRouter();
  const [editing, setEditing] = useState(false);
  const shown = kind === "ph" ? String(row.meterValue) : String(Number(ecInUnit(row.meterValue, ecUnit).toPrecision(6)));
  const [takenAt, setTakenAt] = useState(() => toLocalInput(row.takenAt));
  const [value, setValue] = useState(shown);
  const [note, setNote] = useState(row.note ?? "");
  const [error, setError] = useState<ApiRefusal | null>(null);
  const [busy, setBusy] = useState(false);
  const unit = kind === "ph" ? "pH" : ecUnitLabel(ecUnit);

  const save = async () => {
    setBusy(true);
    setError(null);
    const v = Number(value.replace(",", "."));
    try {
      await api(`/api/spot-checks/${row.id}`, {
        method: "PUT",
        json: { takenAt: new Date(takenAt).getTime(), meterValue: kind === "ec" ? ecToMicrosiemens(v, ecUnit) : v, note: note.trim() || undefined },
      });
      setEditing(false);
      toast.success("Spot check corrected and compared again.");
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiRefusal ? e : new ApiRefusal("The spot check could not be saved.", 500));
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="flex justify-end gap-1">
      <Button type="button" variant="ghost" size="sm" aria-label={`Edit the spot check of ${formatDateTime(row.takenAt)}`} onClick={() => setEditing(true)}>
        <Pencil className="size-4" aria-hidden />
      </Button>
      <ConfirmDialog
        trigger={(open) => (
          <Button type="button" variant="ghost" size="sm" aria-label={`Delete the spot check of ${formatDateTime(row.takenAt)}`} onClick={open}>
            <Trash2 className="size-4" aria-hidden />
          </Button>
        )}
        title="Delete this spot check?"
        description={<>The reading of {formatDateTime(row.takenAt)} ({shown} {unit}) is removed from the probe&apos;s record. The audit log keeps what it said.</>}
        confirmLabel="Delete the spot check"
        onConfirm={async () => {
          try {
            await api(`/api/spot-checks/${row.id}`, { method: "DELETE" });
            toast.success("Spot check deleted.");
            router.refresh();
            return true;
          } catch (e) {
            toast.error(e instanceof ApiRefusal ? e.message : "The spot check could not be deleted.");
            return false;
          }
        }}
      />
      <Dialog open={editing} onClose={() => !busy && setEditing(false)} title="Correct the spot check">
        <form
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            void save();
          }}
        >
          <label className="block text-sm font-medium">
            Taken at
            <input className={FIELD_CLASS} type="datetime-local" name="takenAt" value={takenAt} onChange={(e) => setTakenAt(e.target.value)} />
            {error?.fields.takenAt ? <span className="text-xs font-medium text-bad">{error.fields.takenAt}</span> : null}
          </label>
          <label className="block text-sm font-medium">
            Meter reading ({unit})
            <input className={FIELD_CLASS} inputMode="decimal" name="meterValue" value={value} onChange={(e) => setValue(e.target.value)} />
            {error?.fields.meterValue ? <span className="text-xs font-medium text-bad">{error.fields.meterValue}</span> : null}
          </label>
          <label className="block text-sm font-medium">
            Note
            <input className={FIELD_CLASS} name="note" value={note} onChange={(e) => setNote(e.target.value)} />
          </label>
          {error && !error.fields.takenAt && !error.fields.meterValue ? (
            <p role="alert" className="text-sm font-medium text-bad">
              {error.message}
            </p>
          ) : null}
          <div className="flex justify-end gap-2">
            <Button type="button" variant="secondary" onClick={() => setEditing(false)} disabled={busy}>
              Cancel
            </Button>
            <Button type="submit" disabled={busy}>
              {busy ? "Saving…" : "Save the correction"}
            </Button>
          </div>
        </form>
      </Dialog>
    </div>
  );
}
