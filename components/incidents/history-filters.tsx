// Filters of the incident history as a plain GET form: works without script, and the URL is the
// state (bookmarkable, and the CSV export uses the same query).
import Link from "next/link";
import { Filter } from "lucide-react";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import type { IncidentQuery } from "@/app/api/incidents/filter";

export function HistoryFilters({
  query,
  sites,
  tanks,
  causes,
}: {
  query: IncidentQuery;
  sites: { id: number; name: string }[];
  tanks: { id: number; name: string; siteId: number }[];
  causes: { value: string; label: string }[];
}) {
  const label = "block text-xs font-semibold uppercase tracking-wide text-ink-soft";
  return (
    <form method="get" className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-[repeat(6,minmax(0,1fr))_auto] lg:items-end" aria-label="Filter incidents">
      <label className={label}>
        Site
        <Select name="site" defaultValue={query.site ? String(query.site) : ""} placeholder="Every site" options={sites.map((s) => ({ value: String(s.id), label: s.name }))} className="mt-1 normal-case tracking-normal" />
      </label>
      <label className={label}>
        Tank
        <Select
          name="tank"
          defaultValue={query.tank ? String(query.tank) : ""}
          placeholder="Every tank"
          options={tanks.filter((t) => !query.site || t.siteId === query.site).map((t) => ({ value: String(t.id), label: t.name }))}
          className="mt-1 normal-case tracking-normal"
        />
      </label>
      <label className={label}>
        Cause
        <Select name="cause" defaultValue={query.cause ?? ""} placeholder="Every cause" options={causes} className="mt-1 normal-case tracking-normal" />
      </label>
      <label className={label}>
        State
        <Select
          name="state"
          defaultValue={query.state ?? ""}
          placeholder="Every state"
          options={[
            { value: "open", label: "Open" },
            { value: "acknowledged", label: "Acknowledged" },
            { value: "resolved", label: "Resolved" },
          ]}
          className="mt-1 normal-case tracking-normal"
        />
      </label>
      <label className={label}>
        Opened from
        <Input type="date" name="from" defaultValue={query.from ?? ""} className="mt-1" />
      </label>
      <label className={label}>
        Opened to
        <Input type="date" name="to" defaultValue={query.to ?? ""} className="mt-1" />
      </label>
      <div className="flex gap-2">
        <Button type="submit" size="lg" className="flex-1">
          <Filter className="size-4" aria-hidden /> Apply
        </Button>
        <Link href="/incidents" className="inline-flex h-12 items-center rounded-md px-3 text-sm text-ink-soft hover:bg-paper-sunk">
          Clear
        </Link>
      </div>
    </form>
  );
}
