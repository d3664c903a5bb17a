"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { toast } from "sonner";
import { FlaskConical, PauseCircle, TriangleAlert } from "lucide-react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { bufferPh, ecStandardAt, parseStandardText, standardLabel, type BufferSpec, type EcStandardSpec, type RunStep } from "@/lib/calibration";
import { formatDateTime } from "@/lib/display/time";
import { ApiRefusal, api } from "./api";
import { CaptureForm } from "./capture-form";
import { EffectiveTimeField } from "./effective-time-field";
import { LiveReading, useLive } from "./live-reading";
import { FitSummary } from "./run-result";
import { RunStepsList, stepTitle } from "./run-steps-list";
import { SafetyCautions } from "./safety-cautions";
import type { LiveJson, RunViewJson } from "./types";

export function RunWizard({ runId, canChange, demo }: { runId: number; canChange: boolean; demo: boolean }) {
  const run = useQuery({ queryKey: ["run", runId], queryFn: () => api<RunViewJson>(`/api/calibrations/runs/${runId}`) });
  if (run.isPending) return <p className="text-ink-soft">Loading the run…</p>;
  if (run.isError) return <p role="alert" className="text-bad">{run.error.message}</p>;
  return <Wizard view={run.data} canChange={canChange} demo={demo} />;
}

function Wizard({ view, canChange, demo }: { view: RunViewJson; canChange: boolean; demo: boolean }) {
  const { run, probe, progress } = view;
  const finished = run.status !== "in_progress";
  const step = progress.steps[progress.current];
  const kind = probe.kind === "ec" ? "ec" : "ph";
  return (
    <div className="grid gap-6 lg:grid-cols-[18rem_minmax(0,1fr)]">
      <div className="space-y-4">
        <Card className="p-3">
          <RunStepsList steps={progress.steps} current={progress.current} kind={probe.kind} finished={finished} />
        </Card>
        <p className="flex items-center gap-2 text-sm text-held">
          <PauseCircle className="size-4" aria-hidden />
          {view.tank.onHold ? `${view.tank.name} is on hold: no alerts, dosing inhibited` : `${view.tank.name} is not on hold`}
        </p>
        <SafetyCautions compact />
      </div>
      <Card className="order-first p-5 lg:order-none" data-run-status={run.status} data-current-step={finished ? "finished" : step.key}>
        {!canChange ? <p className="mb-4 rounded-md bg-paper-sunk p-3 text-sm text-ink-soft">View only: your role can follow this run but not change calibrations.</p> : null}
        {finished ? (
          <FinishedPanel view={view} canChange={canChange} demo={demo} />
        ) : step.key === "result" ? (
          <ResultStep view={view} canChange={canChange} />
        ) : step.key === "clean" ? (
          <CleanStep view={view} canChange={canChange} />
        ) : (
          <ReadingStep key={`${step.key}-${step.index ?? 0}`} view={view} step={step} kind={kind} canChange={canChange} demo={demo} />
        )}
      </Card>
    </div>
  );
}

function useRunAction(runId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (o: { path: string; json?: unknown }) => api<Record<string, unknown>>(`/api/calibrations/runs/${runId}/${o.path}`, { method: "POST", json: o.json ?? {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: ["run", runId] }),
    onError: (e) => toast.error(e instanceof ApiRefusal ? e.message : "That did not work; try again."),
  });
}

function expectedText(kind: "ph" | "ec", standard: string, live: LiveJson | undefined): string | undefined {
  const t = live?.temperature?.value;
  if (t === undefined) return undefined;
  try {
    const spec = parseStandardText(standard);
    return kind === "ph" ? `pH ${bufferPh(spec as BufferSpec, t).toFixed(2)} at ${t.toFixed(1)} °C` : `${(ecStandardAt(spec as EcStandardSpec, t) / 1000).toFixed(3)} mS/cm at ${t.toFixed(1)} °C`;
  } catch {
    return undefined;
  }
}

function ReadingStep({ view, step, kind, canChange, demo }: { view: RunViewJson; step: RunStep; kind: "ph" | "ec"; canChange: boolean; demo: boolean }) {
  const live = useLive(view.probe.id);
  const action = useRunAction(view.run.id);
  const standard = step.standard!;
  const asFound = step.key === "as-found";
  const total = view.progress.steps.filter((s) => s.key === "point").length;
  const sameBottle = view.points.find((p) => p.standard === standard && p.lot);
  const simulate = useMutation({
    mutationFn: () => api(`/api/calibrations/runs/${view.run.id}/simulate`, { method: "POST", json: { placeIn: "standard" } }),
    onSuccess: () => toast.success("The simulated probe is in the buffer."),
    onError: (e) => toast.error(e instanceof Error ? e.message : "The simulator did not answer."),
  });
  return (
    <div className="space-y-5">
      <header>
        <p className="text-xs font-semibold uppercase tracking-wide text-accent-700">{asFound ? "Before adjusting" : kind === "ec" ? "Conductivity standard" : `Buffer ${step.index! + 1} of ${total}`}</p>
        <h2 className="text-xl font-semibold">{stepTitle(step, view.probe.kind, total)}</h2>
        <p className="mt-1 text-sm text-ink-soft">
          {asFound
            ? `Put the probe, as it is, into fresh ${standardLabel(standard)}. This reading with the old calibration shows how far the probe drifted since it was last calibrated.`
            : `Rinse the probe with clean water, blot it dry, and put it into fresh ${standardLabel(standard)}. Keep it still and wait for the reading to settle.`}
        </p>
      </header>
      <LiveReading live={live.data} kind={kind} expectedLabel={expectedText(kind, standard, live.data)} />
      {demo && view.tank.controllerId && canChange ? (
        <Button type="button" variant="secondary" size="sm" onClick={() => simulate.mutate()} disabled={simulate.isPending}>
          <FlaskConical className="size-4" aria-hidden /> Demo: place the simulated probe in this {kind === "ec" ? "standard" : "buffer"}
        </Button>
      ) : null}
      {canChange ? (
        <CaptureForm runId={view.run.id} purpose={asFound ? "as_found" : "point"} live={live.data} defaults={{ lot: sameBottle?.lot ?? undefined, expiresOn: sameBottle?.expiresOn ?? undefined }} lotRequired={!asFound} />
      ) : null}
      {asFound && canChange ? (
        <Button type="button" variant="ghost" onClick={() => action.mutate({ path: "steps", json: { step: "skip-as-found" } })}>
          Skip the as-found check
        </Button>
      ) : null}
      {canChange ? <AbandonButton runId={view.run.id} /> : null}
    </div>
  );
}

function CleanStep({ view, canChange }: { view: RunViewJson; canChange: boolean }) {
  const action = useRunAction(view.run.id);
  return (
    <div className="space-y-4">
      <h2 className="text-xl font-semibold">Clean and rinse</h2>
      <ol className="list-decimal space-y-2 pl-5 text-sm">
        <li>Take the probe out and rinse it with clean (ideally deionised) water.</li>
        <li>Clean it as its maker describes, for example a soak in probe cleaning solution.</li>
        <li>Look at the glass for cracks or a coating; a cracked probe must be replaced.</li>
        <li>Rinse again and blot with a soft tissue; do not rub the glass.</li>
      </ol>
      {canChange ? (
        <Button size="lg" onClick={() => action.mutate({ path: "steps", json: { step: "clean" } })} disabled={action.isPending}>
          Done: the probe is clean and rinsed
        </Button>
      ) : null}
      {canChange ? <AbandonButton runId={view.run.id} /> : null}
    </div>
  );
}

function ResultStep({ view, canChange }: { view: RunViewJson; canChange: boolean }) {
  const action = useRunAction(view.run.id);
  const [effectiveAt, setEffectiveAt] = useState<number | null>(null);
  const effectiveError = action.error instanceof ApiRefusal ? action.error.fields.effectiveAt : undefined;
  const preview = view.preview;
  if (!preview) return null;
  if ("error" in preview) {
    return (
      <div className="space-y-3">
        <h2 className="text-xl font-semibold">Result</h2>
        <p role="alert" className="text-bad">{preview.error}</p>
        {canChange ? <AbandonButton runId={view.run.id} /> : null}
      </div>
    );
  }
  const accepted = preview.verdict === "accepted";
  return (
    <div className="space-y-5">
      <h2 className="text-xl font-semibold">Result</h2>
      <FitSummary fit={preview} />
      {!accepted && view.previousRejected ? (
        <p className="flex items-center gap-2 rounded-md border border-bad/40 bg-bad/5 p-3 text-sm font-medium text-bad">
          <TriangleAlert className="size-4" aria-hidden /> The last run on this probe was rejected too: recording this rejection marks the probe for replacement.
        </p>
      ) : null}
      {canChange && accepted ? <EffectiveTimeField value={effectiveAt} onChange={setEffectiveAt} error={effectiveError} /> : null}
      {canChange ? (
        <div className="flex flex-wrap gap-3">
          <Button
            size="lg"
            variant={accepted ? "primary" : "danger"}
            onClick={() => action.mutate({ path: "complete", json: accepted && effectiveAt !== null ? { effectiveAt } : {} })}
            disabled={action.isPending || (effectiveAt !== null && Number.isNaN(effectiveAt))}
          >
            {accepted ? "Save calibration" : "Record the rejection"}
          </Button>
          <AbandonButton runId={view.run.id} />
        </div>
      ) : null}
    </div>
  );
}

function FinishedPanel({ view, canChange, demo }: { view: RunViewJson; canChange: boolean; demo: boolean }) {
  const { run, probe } = view;
  const router = useRouter();
  const qc = useQueryClient();
  const release = useMutation({
    mutationFn: (holdId: number) => api<{ dosing?: { status: string; message: string } }>(`/api/holds/${holdId}/release`, { method: "POST", json: {} }),
    onSuccess: async (r) => {
      if (r.dosing?.status === "failed") toast.warning(r.dosing.message, { duration: 15_000 });
      else toast.success("Hold released: alerts return after a short settling period.");
      await qc.invalidateQueries({ queryKey: ["run", run.id] });
    },
    onError: (e) => toast.error(e instanceof Error ? e.message : "The hold could not be released."),
  });
  const backInTank = useMutation({
    mutationFn: () => api(`/api/calibrations/runs/${run.id}/simulate`, { method: "POST", json: { placeIn: "tank" } }),
    onSuccess: () => toast.success("The simulated probe is back in the tank."),
    onError: (e) => toast.error(e instanceof Error ? e.message : "The simulator did not answer."),
  });
  const [retrying, setRetrying] = useState(false);
  const retry = async () => {
    setRetrying(true);
    try {
      const r = await api<{ runId: number }>("/api/calibrations/runs", { method: "POST", json: { tankId: run.tankId, probeId: run.probeId, standards: run.plannedStandards } });
      router.push(`/calibrations/runs/${r.runId}`);
    } catch (e) {
      toast.error(e instanceof Error ? e.message : "The retry could not start.");
      setRetrying(false);
    }
  };
  if (run.status === "abandoned") return <p>This run was abandoned; nothing took effect.</p>;
  const fit = {
    verdict: run.status as "accepted" | "rejected",
    reasons: run.reasons,
    ...(run.slopePct !== null ? { slopePct: run.slopePct, offsetMv: run.offsetMv ?? 0 } : { cellConstant: run.cellConstant ?? 0, deviationPct: run.deviationPct ?? 0 }),
  };
  return (
    <div className="space-y-5">
      <h2 className="text-xl font-semibold">{run.status === "accepted" ? "Calibration saved" : "Calibration rejected"}</h2>
      <FitSummary fit={fit} />
      {run.status === "accepted" ? (
        <p className="text-sm">
          In force from <span className="num font-medium">{formatDateTime(run.effectiveAt)}</span>: readings from then on are corrected with it. Put the probe back in the tank; release the hold once every probe of{" "}
          <Link className="font-medium text-accent-700 underline" href={`/tanks/${run.tankId}`}>
            the tank
          </Link>{" "}
          is back in the solution.
        </p>
      ) : probe.status === "replace" ? (
        <p data-testid="replace-notice" className="flex items-center gap-2 rounded-md border border-bad/40 bg-bad/5 p-3 font-medium text-bad">
          <TriangleAlert className="size-5" aria-hidden /> This probe was rejected twice in a row and is marked for replacement.
        </p>
      ) : (
        <p className="text-sm">The previous calibration stays in force. Clean the probe, inspect it for cracks, and retry once.</p>
      )}
      <div className="flex flex-wrap gap-3">
        {run.status === "accepted" && canChange && view.tank.holdId ? (
          <Button size="lg" variant="secondary" onClick={() => release.mutate(view.tank.holdId!)} disabled={release.isPending}>
            <PauseCircle className="size-4" aria-hidden /> Release the hold on {view.tank.name}
          </Button>
        ) : null}
        {run.status === "rejected" && canChange ? (
          <Button size="lg" onClick={retry} disabled={retrying}>
            Retry after cleaning
          </Button>
        ) : null}
        <Link href={`/probes/${probe.id}`} className="inline-flex h-12 items-center rounded-md border border-paper-line px-5 font-medium hover:bg-paper-sunk">
          Probe record
        </Link>
        {demo && view.tank.controllerId && canChange ? (
          <Button type="button" variant="secondary" size="lg" onClick={() => backInTank.mutate()} disabled={backInTank.isPending}>
            <FlaskConical className="size-4" aria-hidden /> Demo: put the simulated probe back in the tank
          </Button>
        ) : null}
      </div>
    </div>
  );
}

function AbandonButton({ runId }: { runId: number }) {
  const action = useRunAction(runId);
  return (
    <Button
      type="button"
      variant="ghost"
      size="sm"
      onClick={() => {
        if (window.confirm("Abandon this run? Nothing it measured takes effect.")) action.mutate({ path: "abandon" });
      }}
    >
      Abandon the run
    </Button>
  );
}
