import Link from "next/link";
import type { SiteCompliance } from "@/db/queries/calibration-compliance";
import { Card } from "@/components/ui/card";
import { CalibrationBadge } from "@/components/tanks/state-badge";
import { formatDateTime } from "@/lib/display/time";
import { KIND_LABEL } from "@/components/calibration/probe-options";

/** Owner's review: per site, the share of probes in date, the overdue list, runs per month, rejections. */
export function ComplianceView({ sites }: { sites: SiteCompliance[] }) {
  return (
    <section aria-labelledby="compliance" data-testid="compliance">
      <h2 id="compliance" className="mb-3 text-lg font-semibold">
        Compliance per site
      </h2>
      <div className="grid gap-4 xl:grid-cols-2">
        {sites.map((s) => {
          const max = Math.max(1, ...s.perMonth.map((m) => m.accepted + m.rejected));
          return (
            <Card key={s.site.id} className="p-4" data-site={s.site.id}>
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <h3 className="font-semibold">{s.site.name}</h3>
                <p className="text-xs text-ink-soft">maximum interval {s.site.maxCalibrationIntervalDays} days</p>
              </div>
              <p className="mt-2">
                <span className="num text-3xl font-semibold">{s.sharePct === null ? "—" : `${Math.round(s.sharePct)} %`}</span>
                <span className="ml-2 text-sm text-ink-soft">
                  of probes in date ({s.inDate} of {s.probes} current or due soon)
                </span>
              </p>
              <h4 className="mt-4 text-xs font-semibold uppercase tracking-wide text-ink-soft">Overdue</h4>
              {s.overdue.length ? (
                <ul className="mt-1 space-y-1 text-sm">
                  {s.overdue.map((o) => (
                    <li key={o.probeId} className="flex items-center justify-between gap-2">
                      <Link className="hover:underline" href={`/probes/${o.probeId}`}>
                        {o.tankName} · {KIND_LABEL[o.kind]} <code className="font-mono text-xs">{o.serial}</code>
                      </Link>
                      <span className="flex items-center gap-2">
                        <span className="num text-xs text-ink-soft">{o.dueAt ? `due ${formatDateTime(o.dueAt)}` : ""}</span>
                        <CalibrationBadge status={o.status} />
                      </span>
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="mt-1 text-sm text-ink-soft">Nothing overdue.</p>
              )}
              <h4 className="mt-4 text-xs font-semibold uppercase tracking-wide text-ink-soft">Runs per month</h4>
              <table className="mt-1 w-full text-sm">
                <tbody>
                  {s.perMonth.map((m) => (
                    <tr key={m.month}>
                      <td className="num w-20 py-0.5 text-ink-soft">{m.month}</td>
                      <td className="py-0.5">
                        <div className="flex h-3 overflow-hidden rounded-sm bg-paper-sunk" aria-hidden>
                          <div className="bg-accent-500" style={{ width: `${(m.accepted / max) * 100}%` }} />
                          <div className="bg-bad" style={{ width: `${(m.rejected / max) * 100}%` }} />
                        </div>
                      </td>
                      <td className="num w-40 py-0.5 pl-2 text-right text-xs">
                        {m.accepted} accepted · {m.rejected} rejected
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <h4 className="mt-4 text-xs font-semibold uppercase tracking-wide text-ink-soft">Rejected runs</h4>
              {s.rejected.length ? (
                <ul className="mt-1 space-y-1 text-sm">
                  {s.rejected.map((r) => (
                    <li key={r.id}>
                      <Link className="num font-medium hover:underline" href={`/probes/${r.probeId}`}>
                        {formatDateTime(r.at)} · {r.tankName} {KIND_LABEL[r.kind]} {r.serial}
                      </Link>
                      <p className="text-xs text-bad">{r.reasons.join(" ")}</p>
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="mt-1 text-sm text-ink-soft">No rejected runs in the last six months.</p>
              )}
            </Card>
          );
        })}
      </div>
    </section>
  );
}
