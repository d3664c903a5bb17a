"use client";
// Resolve (grower, owner) and notes (every role) on the incident page; acknowledge is its own button.
import { useState } from "react";
import { useRouter } from "next/navigation";
import { CircleCheck, MessageSquare } from "lucide-react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { postJson } from "./api";

function useSubmit(url: string, done: string) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const submit = async (body: unknown) => {
    setBusy(true);
    try {
      await postJson(url, body);
      toast.success(done);
      router.refresh();
      return true;
    } catch (err) {
      toast.error((err as Error).message);
      return false;
    } finally {
      setBusy(false);
    }
  };
  return { busy, submit };
}

export function NoteForm({ incidentId }: { incidentId: number }) {
  const [note, setNote] = useState("");
  const { busy, submit } = useSubmit(`/api/incidents/${incidentId}/notes`, "Note added");
  return (
    <form
      className="space-y-2"
      onSubmit={async (e) => {
        e.preventDefault();
        if (note.trim() && (await submit({ note }))) setNote("");
      }}
    >
      <label className="block text-sm font-medium" htmlFor="incident-note">
        Add a note
      </label>
      <textarea
        id="incident-note"
        value={note}
        onChange={(e) => setNote(e.target.value)}
        rows={3}
        maxLength={2000}
        placeholder="What you found, what you did"
        className="w-full rounded-md border border-paper-line bg-paper p-3 text-base"
      />
      <Button type="submit" variant="secondary" disabled={busy || !note.trim()}>
        <MessageSquare className="size-4" aria-hidden /> {busy ? "Saving…" : "Add note"}
      </Button>
    </form>
  );
}

export function ResolveForm({ incidentId }: { incidentId: number }) {
  const [open, setOpen] = useState(false);
  const [note, setNote] = useState("");
  const { busy, submit } = useSubmit(`/api/incidents/${incidentId}/resolve`, "Incident resolved");
  if (!open) {
    return (
      <Button type="button" variant="secondary" onClick={() => setOpen(true)}>
        <CircleCheck className="size-4" aria-hidden /> Resolve…
      </Button>
    );
  }
  return (
    <form
      className="flex w-full flex-wrap items-end gap-2"
      onSubmit={async (e) => {
        e.preventDefault();
        await submit({ note: note || undefined });
      }}
    >
      <label className="min-w-[14rem] flex-1 text-sm font-medium">
        What fixed it (optional)
        <input value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} className="mt-1 h-10 w-full rounded-md border border-paper-line bg-paper px-3 text-base" />
      </label>
      <Button type="submit" disabled={busy}>
        <CircleCheck className="size-4" aria-hidden /> {busy ? "Resolving…" : "Resolve"}
      </Button>
      <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
        Cancel
      </Button>
    </form>
  );
}
