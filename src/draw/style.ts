/**
 * The maps' style sheet (fonts and text sizes, label halos, strokes that keep their width when geometry is
 * scaled): the report's page holds it once (src/report/style.ts), a standalone map carries it in its <svg>.
 */
export const MAP_CSS = `
svg.map .geo *, svg.defs .zp { vector-effect: non-scaling-stroke; }
svg.map text { font-family: system-ui, "Noto Sans", "DejaVu Sans", sans-serif; }
svg.map .sample-labels text, svg.map .zone-labels text { font-size: 11px; paint-order: stroke; stroke: #fff; stroke-width: 3px; stroke-linejoin: round; fill: #000; }
svg.map .zone-labels text { font-size: 12px; }
svg.map .lg-title { font-size: 14px; font-weight: 700; }
svg.map .lg-t { font-size: 12.5px; }
svg.map .lg-n { font-size: 11px; fill: #555; }
svg.map .sb-t { font-size: 12px; }
svg.map .n-t { font-size: 14px; font-weight: 700; }
svg.map .sample-labels.low text { font-size: 12px; font-weight: 700; fill: #b10026; }
svg.map .m-title { font-size: 19px; font-weight: 700; }
svg.map .m-sub { font-size: 13px; fill: #444; }
svg.map .cb-t { font-size: 12px; }
svg.map .cb-low { font-size: 12px; font-weight: 700; fill: #b10026; paint-order: stroke; stroke: #fff; stroke-width: 3px; }
`;
