"use client";
import { useState } from "react";
import { TriangleAlert } from "lucide-react";
import { Button } from "./button";
import { Dialog } from "./dialog";

/**
 * Asks before anything destructive (deactivate, retire, revoke). The trigger opens it; the action
 * runs only on the explicit confirm button, and the dialog stays open with its error if it fails.
 */
export function ConfirmDialog({
  trigger,
  title,
  description,
  confirmLabel,
  onConfirm,
}: {
  trigger: (open: () => void) => React.ReactNode;
  title: string;
  description: React.ReactNode;
  confirmLabel: string;
  /** Resolves true when done (the dialog closes), false to keep it open. */
  onConfirm: () => Promise<boolean>;
}) {
  const [open, setOpen] = useState(false);
  const [pending, setPending] = useState(false);
  return (
    <>
      {trigger(() => setOpen(true))}
      <Dialog open={open} onClose={() => !pending && setOpen(false)} title={title}>
        <div className="flex gap-3 rounded-md border border-bad/30 bg-bad/5 p-3 text-sm">
          <TriangleAlert className="mt-0.5 size-5 shrink-0 text-bad" aria-hidden />
          <div>{description}</div>
        </div>
        <div className="mt-5 flex flex-wrap justify-end gap-2">
          <Button type="button" variant="secondary" onClick={() => setOpen(false)} disabled={pending}>
            Cancel
          </Button>
          <Button
            type="button"
            variant="danger"
            disabled={pending}
            onClick={async () => {
              setPending(true);
              try {
                if (await onConfirm()) setOpen(false);
              } finally {
                setPending(false);
              }
            }}
          >
            {pending ? "Working…" : confirmLabel}
          </Button>
        </div>
      </Dialog>
    </>
  );
}
