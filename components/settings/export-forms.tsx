"use client";
import { useState } from "react";
import { Download } from "lucide-react";
import { Card } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { calibrationsExportSchema, readingsExportSchema } from "@/lib/settings/schemas";
import type { TankChoice } from "./probe-forms";

const DAY = 86_400_000;
/** `YYYY-MM-DD` in the browser's time zone, for a date input. */
const dayInput = (ms: number) => new Date(ms - new Date(ms).getTimezoneOffset() * 60_000).toISOString().slice(0, 10);
/** Start of the day typed, local time; the end date is included, so `to` is the next midnight. */
const startOf = (day: string) => new Date(`${day}T00:00`).getTime();

function useRange(days: number) {
  const [today] = useState(() => Date.now());
  const [from, setFrom] = useState(() => dayInput(today - days * DAY));
  const [to, setTo] = useState(() => dayInput(today));
  return { from, to, setFrom, setTo, query: { from: String(startOf(from)), to: String(startOf(to) + DAY) } };
}

/** Validates with the route's own schema, then lets the browser download the streamed CSV. */
function ExportCard({ title, description, children, onExport, errors }: { title: string; description: string; children: React.ReactNode; onExport: () => void; errors: Record<string, string> }) {
  return (
    <Card className="p-4">
      <h2 className="font-semibold">{title}</h2>
      <p className="mb-4 mt-1 text-sm text-ink-soft">{description}</p>
      <form
        noValidate
        className="space-y-4"
        aria-label={title}
        onSubmit={(e) => {
          e.preventDefault();
          onExport();
        }}
      >
        {children}
        {errors._ ? <p className="text-sm text-bad">{errors._}</p> : null}
        <button type="submit" className="inline-flex h-12 items-center gap-2 rounded-md bg-accent-700 px-5 font-medium text-white hover:bg-accent-800 sm:h-10 sm:text-sm">
          <Download className="size-4" aria-hidden /> Download CSV
        </button>
      </form>
    </Card>
  );
}

function fieldErrors(result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) {
  const out: Record<string, string> = {};
  for (const issue of result.error?.issues ?? []) out[String(issue.path[0] ?? "_")] ??= issue.message;
  return out;
}

/** A file download (the route answers with content-disposition: attachment), not a navigation. */
function download(path: string, query: Record<string, string>) {
  const link = document.createElement("a");
  link.href = `${path}?${new URLSearchParams(query)}`;
  link.download = "";
  link.click();
}

export function ExportForms({ tanks, sites }: { tanks: TankChoice[]; sites: { id: number; name: string }[] }) {
  const readings = useRange(7);
  const calibrations = useRange(365);
  const [tank, setTank] = useState(String(tanks[0]?.id ?? ""));
  const [site, setSite] = useState("");
  const [readingErrors, setReadingErrors] = useState<Record<string, string>>({});
  const [calibrationErrors, setCalibrationErrors] = useState<Record<string, string>>({});

  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <ExportCard
        title="Readings"
        description="One tank, every probe: time (UTC), raw signal, corrected value, quality flag and the calibration run used."
        errors={readingErrors}
        onExport={() => {
          const query = { tank, ...readings.query };
          const result = readingsExportSchema.safeParse(query);
          setReadingErrors(fieldErrors(result));
          if (result.success) download("/api/exports/readings", query);
        }}
      >
        <Field label="Tank" error={readingErrors.tank}>
          {(c) => <Select {...c} value={tank} onChange={(e) => setTank(e.target.value)} options={tanks.map((t) => ({ value: String(t.id), label: `${t.name} · ${t.siteName}` }))} />}
        </Field>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field label="From (day)" error={readingErrors.from}>
            {(c) => <Input {...c} type="date" value={readings.from} onChange={(e) => readings.setFrom(e.target.value)} />}
          </Field>
          <Field label="To (day, included)" error={readingErrors.to}>
            {(c) => <Input {...c} type="date" value={readings.to} onChange={(e) => readings.setTo(e.target.value)} />}
          </Field>
        </div>
      </ExportCard>
      <ExportCard
        title="Calibration records"
        description="Every run, accepted and rejected: slope, offset, cell constant, as-found error, reasons, standards and lots, who ran it."
        errors={calibrationErrors}
        onExport={() => {
          const query = { ...(site ? { site } : {}), ...calibrations.query };
          const result = calibrationsExportSchema.safeParse(query);
          setCalibrationErrors(fieldErrors(result));
          if (result.success) download("/api/exports/calibrations", query);
        }}
      >
        <Field label="Site" error={calibrationErrors.site}>
          {(c) => <Select {...c} value={site} onChange={(e) => setSite(e.target.value)} placeholder="Every site" options={sites.map((s) => ({ value: String(s.id), label: s.name }))} />}
        </Field>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field label="From (day)" error={calibrationErrors.from}>
            {(c) => <Input {...c} type="date" value={calibrations.from} onChange={(e) => calibrations.setFrom(e.target.value)} />}
          </Field>
          <Field label="To (day, included)" error={calibrationErrors.to}>
            {(c) => <Input {...c} type="date" value={calibrations.to} onChange={(e) => calibrations.setTo(e.target.value)} />}
          </Field>
        </div>
      </ExportCard>
    </div>
  );
}
