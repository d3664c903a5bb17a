// The printable labels. On screen they sit on a sheet preview; in print only the sheet is shown,
// sized in millimetres, with an @page rule for the chosen stock (A4, or one label per page on a roll).
import { LABEL_FORMATS, type LabelFormat, type LabelKind } from "@/lib/labels/links";

export interface LabelData {
  key: string;
  kind: LabelKind;
  id: number;
  heading: string;
  name: string;
  serial: string;
  site: string;
  action: string;
  url: string;
  /** The QR code as SVG markup, generated on the server by the qrcode package. */
  svg: string;
}

function printCss(format: LabelFormat): string {
  const f = LABEL_FORMATS[format];
  const page = format === "a4" ? "@page { size: A4 portrait; margin: 0; }" : `@page { size: ${f.widthMm}mm ${f.heightMm}mm; margin: 0; }`;
  return `${page}
@media print {
  [data-shell], nav, [data-print="hide"], [data-testid="offline-banner"] { display: none !important; }
  html, body { background: white !important; }
  main { padding: 0 !important; max-width: none !important; }
  body * { visibility: hidden !important; }
  #label-sheet, #label-sheet * { visibility: visible !important; }
  #label-sheet { position: absolute; inset: 0 auto auto 0; margin: 0; padding: 0; box-shadow: none; border: 0; background: white; }
  ${format === "a4" ? "#label-sheet { width: 210mm; padding: 0 0; } .tw-label { border-color: transparent !important; }" : ".tw-label { break-after: page; border: 0 !important; }"}
}`;
}

export function LabelSheet({ labels, format }: { labels: LabelData[]; format: LabelFormat }) {
  const f = LABEL_FORMATS[format];
  return (
    <>
      <style>{printCss(format)}</style>
      <div className="overflow-x-auto rounded-lg bg-paper-sunk p-4 print:overflow-visible print:bg-white print:p-0">
        <div
          id="label-sheet"
          data-format={format}
          className={format === "a4" ? "mx-auto grid bg-white shadow-sm" : "mx-auto flex flex-wrap gap-3"}
          style={format === "a4" ? { width: "210mm", gridTemplateColumns: `repeat(3, ${f.widthMm}mm)`, gridAutoRows: `${f.heightMm}mm` } : { maxWidth: "210mm" }}
        >
          {labels.map((l) => (
            <div
              key={l.key}
              className="tw-label flex items-center gap-[3mm] overflow-hidden border border-dashed border-paper-line bg-white text-black"
              style={{ width: `${f.widthMm}mm`, height: `${f.heightMm}mm`, padding: format === "a4" ? "4mm 4mm" : "2.5mm 3mm" }}
              data-label={l.key}
              data-url={l.url}
            >
              <div data-qr className="shrink-0 bg-white p-[1mm] [&>svg]:block [&>svg]:size-full" style={{ width: `${f.qrMm}mm`, height: `${f.qrMm}mm` }} dangerouslySetInnerHTML={{ __html: l.svg }} role="img" aria-label={`QR code: ${l.action.toLowerCase()}`} />
              <div className="min-w-0 leading-tight">
                <p className="text-[7pt] font-semibold tracking-wide">{l.heading}</p>
                <p className="line-clamp-2 text-[9.5pt] font-bold leading-[1.15]">{l.name}</p>
                <p className="truncate font-mono text-[8pt]">{l.serial}</p>
                <p className="mt-[0.8mm] truncate text-[6.5pt]">{l.site}</p>
                <p className="mt-[0.8mm] text-[6.5pt] font-semibold">{l.action}</p>
              </div>
            </div>
          ))}
        </div>
      </div>
    </>
  );
}
