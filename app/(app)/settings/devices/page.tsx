import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { listDevices } from "@/db/queries/settings-devices";
import { listTankSettings } from "@/db/queries/settings-tanks";
import { mqttUrl } from "@/ingest/topics";
import { PageHeader } from "@/components/ui/card";
import { DevicesEditor } from "@/components/settings/devices-editor";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Devices" };
export const dynamic = "force-dynamic";

export default async function DevicesSettingsPage() {
  const user = await userForSection("devices");
  const [devices, tanks] = await Promise.all([listDevices(getDb(), user.orgId), listTankSettings(getDb(), user.orgId)]);
  return (
    <>
      <PageHeader title="Devices" subtitle="Each tank controller signs in to the broker with its own credentials; revoke them and it is cut off within seconds" />
      <DevicesEditor
        devices={devices}
        freeTanks={tanks.filter((t) => !t.tank.controllerId).map((t) => ({ id: t.tank.id, name: t.tank.name, siteName: t.siteName }))}
        brokerUrl={process.env.MQTT_PUBLIC_URL ?? mqttUrl()}
      />
    </>
  );
}
