"use client";
/** CSV and PNG buttons for one plot. */
import { toCsv, safeFileName, type CsvColumn } from "@/lib/workbench/csv";

export function download(name: string, href: string) {
  const a = document.createElement("a");
  a.href = href;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
}

export function downloadText(name: string, text: string, type: string) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  download(name, url);
  setTimeout(() => URL.revokeObjectURL(url), 5_000);
}

export function ExportButtons({ name, columns, png, testId }: { name: string; columns: () => CsvColumn[] | null; png: () => string | null; testId: string }) {
  const btn = "rounded border border-hairline bg-white px-1.5 py-0.5 text-[11px] text-ink-muted hover:text-ink focus-visible:outline-2 focus-visible:outline-signal";
  return (
    <span className="flex gap-1">
      <button
        type="button"
        className={btn}
        data-testid={`${testId}-csv`}
        aria-label={`Download ${name} as CSV`}
        onClick={() => {
          const cols = columns();
          if (cols) downloadText(safeFileName(name, "csv"), toCsv(cols), "text/csv");
        }}
      >
        CSV
      </button>
      <button
        type="button"
        className={btn}
        data-testid={`${testId}-png`}
        aria-label={`Download ${name} as PNG`}
        onClick={() => {
          const url = png();
          if (url) download(safeFileName(name, "png"), url);
        }}
      >
        PNG
      </button>
    </span>
  );
}
