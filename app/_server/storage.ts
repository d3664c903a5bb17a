// Buffer certificates and photos: checked (size, and type by magic bytes, not the name), stored
// on local disk under UPLOAD_DIR (data/uploads by default) under a generated name, one row in
// `uploads` per file. They are served only as downloads (see the certificate route).
import fs from "node:fs/promises";
import path from "node:path";
import crypto from "node:crypto";
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { uploads } from "@/db/schema";
import { ApiError } from "./errors";

export const MAX_UPLOAD_BYTES = 5 * 1024 * 1024;
export const UPLOAD_TYPES = ["application/pdf", "image/png", "image/jpeg"] as const;
export type UploadType = (typeof UPLOAD_TYPES)[number];

export function uploadDir(): string {
  return process.env.UPLOAD_DIR ?? path.join(process.cwd(), "data", "uploads");
}

/** The file's type from its first bytes: PDF "%PDF-", PNG's 8-byte signature, JPEG's FF D8 FF. */
export function sniffType(bytes: Uint8Array): UploadType | null {
  const starts = (sig: number[]) => sig.every((b, i) => bytes[i] === b);
  if (starts([0x25, 0x50, 0x44, 0x46, 0x2d])) return "application/pdf";
  if (starts([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return "image/png";
  if (starts([0xff, 0xd8, 0xff])) return "image/jpeg";
  return null;
}

const EXTENSION: Record<UploadType, string> = { "application/pdf": ".pdf", "image/png": ".png", "image/jpeg": ".jpg" };

/**
 * A name safe to show and to send back in Content-Disposition, ending in the extension of the
 * type the bytes were checked to be (a PDF named `page.html` is kept as `page.pdf`).
 */
export function storedName(name: string, mime: UploadType): string {
  const base = path.basename(name).replace(/[^\w.\- ()]+/g, "_");
  const stem = base.replace(/\.[^.]*$/, "").replace(/^[.\s]+/, "").slice(0, 110);
  return `${stem || "certificate"}${EXTENSION[mime]}`;
}

export async function storeUpload(db: Db, o: { orgId: number; userId: number; filename: string; bytes: Uint8Array }) {
  if (o.bytes.byteLength === 0) throw new ApiError(400, "empty_file", "The file is empty.");
  if (o.bytes.byteLength > MAX_UPLOAD_BYTES) throw new ApiError(413, "too_large", "The file is larger than 5 MB; scan or photograph it at a lower resolution.");
  const mime = sniffType(o.bytes);
  if (!mime) throw new ApiError(415, "unsupported_type", "Only PDF, PNG and JPEG files can be attached; this file is none of them, whatever its name says.");
  const storageKey = path.join(String(o.orgId), `${crypto.randomUUID()}`);
  const full = path.join(/*turbopackIgnore: true*/ uploadDir(), storageKey);
  await fs.mkdir(path.dirname(full), { recursive: true });
  await fs.writeFile(full, o.bytes);
  const [row] = await db
    .insert(uploads)
    .values({ orgId: o.orgId, filename: storedName(o.filename, mime), mime, size: o.bytes.byteLength, storageKey, uploadedBy: o.userId })
    .returning();
  return row;
}

/** The upload and its bytes, or null when it is not in this organisation (or the file is gone). */
export async function readUpload(db: Db, orgId: number, id: number) {
  const [row] = await db.select().from(uploads).where(and(eq(uploads.id, id), eq(uploads.orgId, orgId)));
  if (!row) return null;
  try {
    const bytes = await fs.readFile(path.join(/*turbopackIgnore: true*/ uploadDir(), row.storageKey));
    return { row, bytes };
  } catch {
    return null;
  }
}
