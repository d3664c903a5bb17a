"use client";
import { useState } from "react";
import { MapPin, Pencil, Plus, Trash2 } from "lucide-react";
import { createZoneAction, deleteZoneAction, renameZoneAction } from "@/app/(app)/settings/sites/actions";
import type { SiteRow } from "@/db/queries/settings-sites";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { Dialog } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { ROLE_NAMES } from "@/lib/settings/enums";
import { zoneSchema } from "@/lib/settings/schemas";
import { SubmitButton } from "./form-bits";
import { SiteForm } from "./site-form";
import { runAction, useServerForm } from "./use-server-form";

const hh = (h: number) => `${String(h).padStart(2, "0")}:00`;

export function SitesEditor({ sites, timeZones }: { sites: SiteRow[]; timeZones: string[] }) {
  const [editing, setEditing] = useState<SiteRow | "new" | null>(null);
  return (
    <>
      <div className="mb-4">
        <Button onClick={() => setEditing("new")}>
          <Plus className="size-4" aria-hidden /> Add site
        </Button>
      </div>
      {sites.length === 0 ? <p className="text-ink-soft">No sites yet. Add your first site, then its zones and tanks.</p> : null}
      <div className="grid gap-4 lg:grid-cols-2">
        {sites.map((site) => (
          <Card key={site.id} data-site={site.name} className="p-4">
            <div className="flex items-start justify-between gap-3">
              <div>
                <h2 className="flex items-center gap-2 text-lg font-semibold">
                  <MapPin className="size-4 text-ink-soft" aria-hidden /> {site.name}
                </h2>
                <p className="text-sm text-ink-soft">{site.timeZone}</p>
              </div>
              <Button variant="secondary" size="sm" className="h-10" onClick={() => setEditing(site)}>
                <Pencil className="size-4" aria-hidden /> Edit
              </Button>
            </div>
            <dl className="num mt-3 grid grid-cols-2 gap-x-4 gap-y-1 text-sm">
              <dt className="text-ink-soft">Day shift</dt>
              <dd>
                from {hh(site.dayStartHour)} · {ROLE_NAMES[site.dayRole]}
              </dd>
              <dt className="text-ink-soft">Night shift</dt>
              <dd>
                from {hh(site.nightStartHour)} · {ROLE_NAMES[site.nightRole]}
              </dd>
              <dt className="text-ink-soft">Escalate after</dt>
              <dd>{site.escalateAfterMinutes} min</dd>
              <dt className="text-ink-soft">Calibrate at least every</dt>
              <dd>{site.maxCalibrationIntervalDays} days</dd>
              <dt className="text-ink-soft">Longest hold</dt>
              <dd>{site.maxHoldMinutes} min</dd>
            </dl>
            <h3 className="mb-2 mt-4 text-sm font-semibold">Zones</h3>
            <ul className="divide-y divide-paper-line rounded-md border border-paper-line">
              {site.zones.map((z) => (
                <ZoneRow key={z.id} zone={z} />
              ))}
              {site.zones.length === 0 ? <li className="px-3 py-2 text-sm text-ink-soft">No zones yet.</li> : null}
            </ul>
            <NewZoneForm siteId={site.id} siteName={site.name} />
          </Card>
        ))}
      </div>
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === "new" ? "New site" : editing ? `Edit ${editing.name}` : ""} className="w-[min(44rem,calc(100vw-2rem))]">
        {editing ? <SiteForm key={editing === "new" ? "new" : editing.id} site={editing === "new" ? undefined : editing} timeZones={timeZones} onDone={() => setEditing(null)} /> : null}
      </Dialog>
    </>
  );
}

function ZoneRow({ zone }: { zone: SiteRow["zones"][number] }) {
  const [renaming, setRenaming] = useState(false);
  const [name, setName] = useState(zone.name);
  return (
    <li className="flex min-h-12 items-center justify-between gap-2 px-3 py-1.5 text-sm">
      {renaming ? (
        <form
          className="flex flex-1 gap-2"
          onSubmit={async (e) => {
            e.preventDefault();
            if (await runAction(() => renameZoneAction({ id: zone.id, values: { name } }), (d) => `Zone renamed to ${d.name}.`)) setRenaming(false);
          }}
        >
          <Input aria-label="Zone name" value={name} onChange={(e) => setName(e.target.value)} className="h-10" />
          <Button type="submit" size="sm" className="h-10">
            Save
          </Button>
        </form>
      ) : (
        <>
          <span>
            {zone.name} <span className="text-ink-soft">· {zone.tankCount} tank{zone.tankCount === 1 ? "" : "s"}</span>
          </span>
          <span className="flex gap-1">
            <Button variant="ghost" size="sm" className="h-10" aria-label={`Rename ${zone.name}`} onClick={() => setRenaming(true)}>
              <Pencil className="size-4" aria-hidden />
            </Button>
            <ConfirmDialog
              title={`Delete zone ${zone.name}?`}
              description="Only an empty zone can be deleted; move its tanks to another zone first."
              confirmLabel="Delete zone"
              onConfirm={async () => Boolean(await runAction(() => deleteZoneAction({ id: zone.id }), (d) => `Zone ${d.name} deleted.`))}
              trigger={(open) => (
                <Button variant="ghost" size="sm" className="h-10 text-bad" aria-label={`Delete ${zone.name}`} onClick={open}>
                  <Trash2 className="size-4" aria-hidden />
                </Button>
              )}
            />
          </span>
        </>
      )}
    </li>
  );
}

function NewZoneForm({ siteId, siteName }: { siteId: number; siteName: string }) {
  const { form, onSubmit } = useServerForm({
    schema: zoneSchema,
    defaultValues: { siteId, name: "" },
    action: createZoneAction,
    success: (d) => `Zone ${d.name} added.`,
    onSuccess: (_d, f) => f.reset({ siteId, name: "" }),
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="mt-3 flex items-start gap-2" aria-label={`New zone in ${siteName}`}>
      <Field label={<span className="sr-only">New zone name</span>} error={errors.name?.message} className="flex-1">
        {(c) => <Input {...c} {...form.register("name")} placeholder="New zone (house, room, bay)" />}
      </Field>
      <div className="pt-1">
        <SubmitButton pending={isSubmitting} pendingLabel="Adding…">
          Add zone
        </SubmitButton>
      </div>
    </form>
  );
}
