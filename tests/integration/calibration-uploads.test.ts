// Buffer certificates on local disk: type by magic bytes (not the name), size limit, and
// reading back only within the organisation. A real temporary database and upload folder.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "@/db/client";
import * as schema from "@/db/schema";
import { MAX_UPLOAD_BYTES, readUpload, sniffType, storedName, storeUpload } from "@/app/_server/storage";
import { refusal } from "./helpers/refusal";
import { useTestDatabase } from "./helpers/use-test-database";

const testDb = useTestDatabase({ label: "uploads", seed: false, per: "file" });
let db: Db;
let orgs: number[];
let userId: number;

const PNG = Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
const PDF = new TextEncoder().encode("%PDF-1.7\n% buffer certificate\n");
const JPEG = Uint8Array.from([0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46]);

beforeAll(async () => {
  process.env.UPLOAD_DIR = path.join(testDb.db.dir, "uploads");
  db = testDb.orm;
  orgs = (await db.insert(schema.organisations).values([{ name: "A" }, { name: "B" }]).returning()).map((o) => o.id);
  [{ id: userId }] = await db.insert(schema.users).values({ orgId: orgs[0], email: "g@a.example", name: "G", role: "grower" }).returning();
});

afterAll(() => {
  delete process.env.UPLOAD_DIR;
});

describe("certificate uploads", () => {
  it("knows PDF, PNG and JPEG by their first bytes", () => {
    expect(sniffType(PDF)).toBe("application/pdf");
    expect(sniffType(PNG)).toBe("image/png");
    expect(sniffType(JPEG)).toBe("image/jpeg");
    expect(sniffType(new TextEncoder().encode("<html>"))).toBeNull();
  });

  it("stores a file under UPLOAD_DIR and reads it back for its organisation only", async () => {
    const row = await storeUpload(db, { orgId: orgs[0], userId, filename: "../../cert lot B7.pdf", bytes: PDF });
    expect(row.mime).toBe("application/pdf");
    expect(row.filename).toBe("cert lot B7.pdf");
    expect(fs.existsSync(path.join(process.env.UPLOAD_DIR!, row.storageKey))).toBe(true);
    const back = await readUpload(db, orgs[0], row.id);
    expect(Buffer.from(back!.bytes).equals(Buffer.from(PDF))).toBe(true);
    expect(await readUpload(db, orgs[1], row.id)).toBeNull();
  });

  it("refuses a file whose content is not what its name says, and one over 5 MB", async () => {
    const fake = await refusal(storeUpload(db, { orgId: orgs[0], userId, filename: "photo.png", bytes: new TextEncoder().encode("MZ\x90\x00 not an image") }));
    expect(fake.status).toBe(415);
    const big = new Uint8Array(MAX_UPLOAD_BYTES + 1);
    big.set(PNG);
    expect((await refusal(storeUpload(db, { orgId: orgs[0], userId, filename: "big.png", bytes: big }))).status).toBe(413);
  });

  it("stores a file under a generated name, named after the type its bytes were checked to be", async () => {
    // Starts like a PDF, holds HTML, named .html: kept as a PDF download called .pdf.
    const disguised = new TextEncoder().encode("%PDF-1.4\n<html><script>alert(1)</script></html>");
    const row = await storeUpload(db, { orgId: orgs[0], userId, filename: "invoice.html", bytes: disguised });
    expect(row.mime).toBe("application/pdf");
    expect(row.filename).toBe("invoice.pdf");
    expect(path.basename(row.storageKey)).toMatch(/^[0-9a-f-]{36}$/);
    expect(storedName("scan.final.JPEG", "image/jpeg")).toBe("scan.final.jpg");
    expect(storedName("../..", "image/png")).toBe("certificate.png");
    expect(storedName(".htaccess", "application/pdf")).toBe("certificate.pdf");
  });
});
