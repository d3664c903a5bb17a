"use client";
// One click acknowledges every open incident of a tank (wall tile, incident page).
import { useState } from "react";
import { useRouter } from "next/navigation";
import { useQueryClient } from "@tanstack/react-query";
import { Eye } from "lucide-react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { postJson } from "./api";

export function AcknowledgeButton({ incidentIds, label = "Acknowledge", size = "sm" }: { incidentIds: number[]; label?: string; size?: "sm" | "md" | "lg" }) {
  const [busy, setBusy] = useState(false);
  const router = useRouter();
  const client = useQueryClient();
  if (incidentIds.length === 0) return null;
  async function acknowledge() {
    setBusy(true);
    try {
      for (const id of incidentIds) await postJson(`/api/incidents/${id}/acknowledge`);
      toast.success(incidentIds.length > 1 ? `${incidentIds.length} incidents acknowledged` : "Incident acknowledged");
    } catch (err) {
      toast.error((err as Error).message);
    } finally {
      setBusy(false);
      void client.invalidateQueries({ queryKey: ["tanks"] });
      router.refresh();
    }
  }
  return (
    <Button type="button" size={size} variant="danger" disabled={busy} onClick={acknowledge} data-action="acknowledge">
      <Eye className="size-4" aria-hidden />
      {busy ? "Acknowledging…" : incidentIds.length > 1 ? `${label} ${incidentIds.length}` : label}
    </Button>
  );
}
