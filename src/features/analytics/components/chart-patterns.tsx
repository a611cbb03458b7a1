/**
 * Hatch patterns for the downtime states, shared by every chart on the page (pattern ids work
 * across the SVGs of one document). With them a bar reads as downtime without its colour, for
 * colour-blind readers, in the amber room and on a black-and-white printout.
 */
export function ChartPatterns() {
  return (
    <svg width="0" height="0" aria-hidden="true" focusable="false" className="absolute">
      <defs>
        <pattern id="analytics-hatch-down" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="6" height="6" fill="#c42a25" />
          <line x1="0" y1="0" x2="0" y2="6" stroke="#ffffff" strokeWidth="2" />
        </pattern>
        <pattern id="analytics-hatch-maintenance" width="6" height="6" patternUnits="userSpaceOnUse">
          <rect width="6" height="6" fill="#2160c0" />
          <circle cx="3" cy="3" r="1.2" fill="#ffffff" />
        </pattern>
      </defs>
    </svg>
  );
}

export function seriesFill(color: string, pattern: 'down' | 'maintenance' | null): string {
  return pattern ? `url(#analytics-hatch-${pattern})` : color;
}
