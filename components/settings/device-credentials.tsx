"use client";
import { useState } from "react";
import { Check, Copy, KeyRound } from "lucide-react";
import type { IssuedCredentials } from "@/db/queries/settings-devices";
import { Button } from "@/components/ui/button";
import { topicsForController } from "@/lib/settings/device-topics";

function CopyValue({ label, value }: { label: string; value: string }) {
  const [copied, setCopied] = useState(false);
  return (
    <div>
      <dt className="text-xs font-medium uppercase tracking-wide text-ink-soft">{label}</dt>
      <dd className="mt-0.5 flex items-center gap-2">
        <code data-credential={label} className="min-w-0 flex-1 break-all rounded bg-paper-sunk px-2 py-1.5 font-mono text-sm">
          {value}
        </code>
        <Button
          type="button"
          variant="ghost"
          size="sm"
          className="h-10"
          aria-label={`Copy ${label}`}
          onClick={async () => {
            await navigator.clipboard?.writeText(value).catch(() => undefined);
            setCopied(true);
          }}
        >
          {copied ? <Check className="size-4" aria-hidden /> : <Copy className="size-4" aria-hidden />}
        </Button>
      </dd>
    </div>
  );
}

/** Shown once, right after registering or rotating: the secret is not stored anywhere readable. */
export function DeviceCredentials({ credentials, brokerUrl, onDone }: { credentials: IssuedCredentials; brokerUrl: string; onDone: () => void }) {
  const t = topicsForController(credentials.controllerId);
  return (
    <div className="space-y-4">
      <p className="flex items-start gap-2 rounded-md border border-warn/30 bg-warn/5 px-3 py-2 text-sm">
        <KeyRound className="mt-0.5 size-4 shrink-0 text-warn" aria-hidden />
        Copy the secret into the controller now. Tidewell keeps only a hash of it and cannot show it again; if it is lost, rotate the credentials.
      </p>
      <dl className="space-y-3">
        <CopyValue label="Broker" value={brokerUrl} />
        <CopyValue label="Client id" value={credentials.controllerId} />
        <CopyValue label="Username" value={credentials.username} />
        <CopyValue label="Secret" value={credentials.secret} />
        <CopyValue label="Publish raw signals to" value={t.raw} />
        <CopyValue label="Subscribe to commands" value={t.commands} />
      </dl>
      <div className="flex justify-end">
        <Button onClick={onDone}>I have copied the secret</Button>
      </div>
    </div>
  );
}
