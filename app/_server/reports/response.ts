/** A generated PDF as a download. */
export function pdfResponse({ pdf, filename }: { pdf: Buffer; filename: string }): Response {
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="${filename}"`,
      "cache-control": "private, no-store",
    },
  });
}
