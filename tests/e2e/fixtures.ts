// A second organisation, to prove that nobody sees another farm's records.
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { organisations, sites, tanks, users } from "@/db/schema";

export const OTHER_ORG_USER = { email: "owner@elsewhere.example", password: "another-farm-pass" };

export async function addOtherOrganisation() {
  const db = getDb();
  const existing = await db.query.users.findFirst({ where: eq(users.email, OTHER_ORG_USER.email) });
  if (existing) return;
  const [org] = await db.insert(organisations).values({ name: "Elsewhere Farm" }).returning();
  await db.insert(users).values({ orgId: org.id, email: OTHER_ORG_USER.email, name: "Other Owner", role: "owner", passwordHash: await bcrypt.hash(OTHER_ORG_USER.password, 8) });
  const [site] = await db.insert(sites).values({ orgId: org.id, name: "Elsewhere Site" }).returning();
  await db.insert(tanks).values({ siteId: site.id, name: "Elsewhere Tank", crop: "leafy greens", phMin: 5.5, phMax: 6.5, ecMinUs: 800, ecMaxUs: 1200 });
}
