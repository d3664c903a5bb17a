import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Paperclip } from "lucide-react";
import { requestNow } from "@/app/_server/clock";
import { currentUser } from "@/app/_server/session";
import { ApiError } from "@/app/_server/errors";
import { getDb } from "@/db/client";
import { probeRecord } from "@/db/queries/calibration-history";
import { listSpotChecks } from "@/db/queries/spot-checks";
import { Card, PageHeader } from "@/components/ui/card";
import { CalibrationBadge } from "@/components/tanks/state-badge";
import { TrendChart } from "@/components/calibration/trend-chart";
import { SpotCheckTable } from "@/components/calibration/spot-check-table";
import { standardLabel } from "@/lib/calibration";
import { formatDateTime } from "@/lib/display/time";

export const metadata: Metadata = { title: "Probe" };
export const dynamic = "force-dynamic";

const LIFECYCLE = { active: "In service", replace: "Marked for replacement", retired: "Retired" } as const;

export default async function ProbePage({ params }: { params: Promise<{ id: string }> }) {
  const user = (await currentUser())!;
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const db = getDb();
  const now = requestNow();
  const record = await probeRecord(db, user.orgId, id, now).catch((e: unknown) => {
    if (e instanceof ApiError && e.status === 404) return null;
    throw e;
  });
  if (!record) notFound();
  const { probe, tank, drift } = record;
  const spot = probe.kind === "temp" ? null : await listSpotChecks(db, user.orgId, id, 20);
  const canChange = user.role !== "night_manager";
  const accepted = record.runs.filter((r) => r.status === "accepted" && r.effectiveAt !== null).reverse();
  const trend = accepted.map((r) => (probe.kind === "ph" ? { at: r.effectiveAt!, a: r.slopePct ?? 0, b: r.offsetMv ?? 0 } : { at: r.effectiveAt!, a: r.cellConstant ?? 0 }));
  const suggested = drift ? Math.min(drift.suggestedDueAt, record.dueAt ?? Infinity) : record.dueAt;
  return (
    <>
      <PageHeader
        title={`${probe.kind === "ph" ? "pH" : probe.kind === "ec" ? "EC" : "Temperature"} probe ${probe.serial}`}
        subtitle={
          <>
            <Link className="underline" href={`/tanks/${tank.id}`}>
              {tank.name}
            </Link>{" "}
            · {record.site.name}
          </>
        }
        actions={
          canChange && probe.kind !== "temp" && probe.status !== "retired" ? (
            <Link href={`/calibrations/new?tank=${tank.id}&probe=${probe.id}`} className="inline-flex h-11 items-center rounded-md bg-accent-700 px-4 text-sm font-medium text-white hover:bg-accent-800">
              Calibrate this probe
            </Link>
          ) : null
        }
      />
      <div className="mb-6 grid gap-4 sm:grid-cols-2 xl:grid-cols-4">
        <Card className="p-4" data-testid="probe-status">
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Calibration status</p>
          <p className="mt-2 text-lg">
            <CalibrationBadge status={record.status} />
          </p>
          <p className="num mt-1 text-xs text-ink-soft">Last accepted {formatDateTime(record.lastAccepted?.effectiveAt)}</p>
        </Card>
        <Card className="p-4" data-testid="next-due">
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Suggested next due</p>
          <p className="num mt-2 text-lg font-semibold">{formatDateTime(suggested)}</p>
          <p className="text-xs text-ink-soft">From the drift rate, never later than {record.intervalDays} days after the last calibration.</p>
        </Card>
        <Card className="p-4" data-testid="drift">
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Drift rate</p>
          <p className="num mt-2 text-lg font-semibold">
            {drift?.ratePerDay != null ? `${drift.ratePerDay.toFixed(probe.kind === "ph" ? 4 : 3)} ${drift.unit} per day` : "—"}
          </p>
          <p className="text-xs text-ink-soft">{drift?.checks ? `From ${drift.checks} as-found check${drift.checks > 1 ? "s" : ""}` : "Needs an as-found check before a recalibration"}</p>
        </Card>
        <Card className="p-4" data-testid="lifecycle">
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Lifecycle</p>
          <p className={`mt-2 text-lg font-semibold ${probe.status === "replace" ? "text-bad" : ""}`}>{LIFECYCLE[probe.status]}</p>
          <ul className="num mt-1 space-y-0.5 text-xs text-ink-soft">
            <li>Installed {formatDateTime(probe.installedAt)}</li>
            {probe.retiredAt ? <li>Retired {formatDateTime(probe.retiredAt)}</li> : null}
            {record.replacedBy ? (
              <li>
                Replaced by{" "}
                <Link className="underline" href={`/probes/${record.replacedBy.id}`}>
                  {record.replacedBy.serial}
                </Link>
              </li>
            ) : null}
            {record.replaces.map((p) => (
              <li key={p.id}>
                Replaces{" "}
                <Link className="underline" href={`/probes/${p.id}`}>
                  {p.serial}
                </Link>
              </li>
            ))}
          </ul>
        </Card>
      </div>
      {probe.kind !== "temp" ? (
        <Card className="mb-6 p-4">
          <h2 className="mb-3 font-semibold">{probe.kind === "ph" ? "Slope and offset over time" : "Cell constant over time"}</h2>
          <TrendChart points={trend} kind={probe.kind} />
        </Card>
      ) : null}
      <Card className="mb-6 overflow-x-auto">
        <h2 className="px-4 pt-4 font-semibold">Calibration history</h2>
        <table className="mt-2 w-full min-w-[900px] text-sm" data-testid="history">
          <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-4 py-2">When</th>
              <th className="px-4 py-2">Outcome</th>
              <th className="px-4 py-2">Result</th>
              <th className="px-4 py-2">As found</th>
              <th className="px-4 py-2">Buffers · lots</th>
              <th className="px-4 py-2">By</th>
            </tr>
          </thead>
          <tbody>
            {record.runs.map((r) => (
              <tr key={r.id} data-run={r.id} data-run-status={r.status} className="border-b border-paper-line align-top last:border-0">
                <td className="num px-4 py-2">
                  {r.status === "in_progress" ? (
                    <Link className="underline" href={`/calibrations/runs/${r.id}`}>
                      {formatDateTime(r.startedAt)}
                    </Link>
                  ) : (
                    formatDateTime(r.completedAt ?? r.startedAt)
                  )}
                  <div className="text-xs text-ink-soft">{r.source === "manual" ? "entered by hand" : "guided run"}</div>
                </td>
                <td className="px-4 py-2">
                  <span className={r.status === "accepted" ? "font-semibold text-ok" : r.status === "rejected" ? "font-semibold text-bad" : "text-ink-soft"}>
                    {r.status === "accepted" ? "✓ accepted" : r.status === "rejected" ? "✕ rejected" : r.status === "in_progress" ? "in progress" : "abandoned"}
                  </span>
                  {r.reasons.length ? <div className="max-w-xs text-xs text-ink-soft">{r.reasons.join(" ")}</div> : null}
                </td>
                <td className="num px-4 py-2">
                  {r.slopePct !== null ? `${r.slopePct.toFixed(1)} % · ${r.offsetMv?.toFixed(1)} mV` : r.cellConstant !== null ? `K ${r.cellConstant.toPrecision(4)} /cm (${(r.deviationPct ?? 0) >= 0 ? "+" : ""}${r.deviationPct?.toFixed(1)} %)` : "—"}
                </td>
                <td className="num px-4 py-2">
                  {r.asFoundErrorPh !== null ? `${r.asFoundErrorPh >= 0 ? "+" : ""}${r.asFoundErrorPh.toFixed(3)} pH` : r.asFoundErrorPct !== null ? `${r.asFoundErrorPct >= 0 ? "+" : ""}${r.asFoundErrorPct.toFixed(1)} %` : "—"}
                </td>
                <td className="px-4 py-2 text-xs">
                  {r.points
                    .filter((p) => p.purpose === "point")
                    .map((p) => (
                      <div key={p.id}>
                        {standardLabel(p.standard)} · lot {p.lot ?? "—"} · exp. {p.expiresOn ?? "—"}
                        {!p.stable ? <span className="font-semibold text-warn"> · captured before settling{p.note ? `: ${p.note}` : ""}</span> : null}
                      </div>
                    ))}
                  {r.upload ? (
                    <a className="mt-1 inline-flex items-center gap-1 font-medium text-accent-700 underline" href={`/api/calibrations/runs/${r.id}/certificate`}>
                      <Paperclip className="size-3.5" aria-hidden /> {r.upload.filename}
                    </a>
                  ) : null}
                </td>
                <td className="px-4 py-2 text-xs text-ink-soft">{r.userName ?? "—"}</td>
              </tr>
            ))}
            {record.runs.length === 0 ? (
              <tr>
                <td colSpan={6} className="px-4 py-6 text-center text-ink-soft">
                  Never calibrated.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </Card>
      {spot ? (
        <Card className="overflow-x-auto p-4">
          <div className="mb-2 flex items-center justify-between">
            <h2 className="font-semibold">Spot checks</h2>
            {canChange ? (
              <Link className="text-sm font-medium text-accent-700 underline" href={`/calibrations/spot-checks?probe=${probe.id}`}>
                Enter a spot check
              </Link>
            ) : null}
          </div>
          <SpotCheckTable rows={spot.rows} kind={spot.kind} tolerance={spot.tolerance} ecUnit={user.ecUnit} canChange={canChange} />
        </Card>
      ) : null}
    </>
  );
}
