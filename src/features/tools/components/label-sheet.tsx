import type { ToolLabel } from '@shared/schemas/facility';

/**
 * A printable sheet: one label per tool with its QR code (opening the tool page), name,
 * code and area. Sized for adhesive label stock of about 63 × 38 mm in a 3-column grid.
 */
export function LabelSheet({ labels }: { labels: ToolLabel[] }) {
  return (
    <ul
      className="label-sheet grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3 print:grid-cols-3 print:gap-2"
      data-testid="label-sheet"
    >
      {labels.map((label) => (
        <li
          key={label.toolId}
          data-testid={`label-${label.code}`}
          className="flex break-inside-avoid items-center gap-3 rounded-lg border border-ink bg-white p-3 text-black print:rounded-none"
        >
          <img
            src={`data:image/svg+xml;charset=utf-8,${encodeURIComponent(label.svg)}`}
            alt={`QR code for ${label.url}`}
            width={132}
            height={132}
            className="size-[132px] shrink-0"
            data-testid="label-qr"
          />
          <div className="min-w-0">
            <p className="text-base leading-tight font-bold">{label.name}</p>
            <p className="mt-1 font-mono text-lg font-bold tracking-wide">{label.code}</p>
            <p className="mt-1 text-xs">{label.areaName}</p>
            <p className="mt-2 text-xs">Scan to see its state or report a fault.</p>
          </div>
        </li>
      ))}
    </ul>
  );
}
