package ui

// reportCSS is the report's stylesheet: the same text as web/report.css
// (TestReportCSSMatchesFile keeps the two equal). The app loads the file;
// a saved report carries this copy inline, so it needs nothing else.
const reportCSS = `/* The printable report (app/ui/report.go). The same text is inlined into a
   saved report file (app/ui/reportcss.go; a test keeps the two equal), so it
   must stand alone: no variables from other stylesheets, nothing fetched. */
/* While the report is open it is the page: the screen behind it is hidden
   (and comes back as it was when the report closes). */
.pl-app:has(.pl-report-view) > :not(.pl-report-view) { display: none !important; }
.pl-report-view { min-height: 100vh; background: #e9e6df; }
.pl-report-tools {
  position: sticky; top: 0; z-index: 1; display: flex; flex-wrap: wrap; gap: 8px; align-items: center;
  padding: 8px 12px; background: #0b4f5c; color: #fff;
}
.pl-report-tools .pl-btn-quiet { background: transparent; color: #fff; border-color: #fff; }
.pl-report {
  max-width: 980px; margin: 12px auto; padding: 18px 22px; background: #fff; color: #101418;
  font-family: system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", sans-serif; line-height: 1.4;
  border: 1px solid #8a949c; border-radius: 6px;
}
.pl-report h1 { font-size: 1.5rem; margin: 0 0 4px; }
.pl-report h2 { font-size: 1.15rem; margin: 0 0 8px; padding-bottom: 3px; border-bottom: 2px solid #0b4f5c; }
.pl-report h3 { font-size: 1rem; margin: 12px 0 6px; }
.pl-report-kicker { margin: 0; font-weight: 700; color: #0b4f5c; letter-spacing: 0.04em; text-transform: uppercase; font-size: 0.85rem; }
.pl-report-when, .pl-report-small, .pl-report-foot { color: #3a434b; font-size: 0.88rem; }
.pl-report-sec { margin: 18px 0 0; }
.pl-report-eq { font-size: 1.15rem; font-variant-numeric: tabular-nums; }
.pl-report-msg { padding: 10px; border-left: 6px solid #7a4a00; background: #fffbea; }
.pl-rt { width: 100%; border-collapse: collapse; margin: 6px 0 10px; font-size: 0.92rem; font-variant-numeric: tabular-nums; }
.pl-rt th, .pl-rt td { text-align: left; vertical-align: top; padding: 4px 6px; border-bottom: 1px solid #c3c9cd; overflow-wrap: break-word; }
.pl-rt td { overflow-wrap: anywhere; }
.pl-rt-checks tbody th { width: 9.5em; }
.pl-rt thead th { border-bottom: 2px solid #3a434b; font-size: 0.85rem; color: #3a434b; }
.pl-rt-meta th { width: 30%; }
.pl-rt-figs { max-width: 520px; }
.pl-rt-excl td { color: #3a434b; background: #f1efe9; }
.pl-rt-excl td:nth-child(2), .pl-rt-excl td:nth-child(3) { text-decoration: line-through; }
.pl-rt-bad td { background: #fde8e8; }
.pl-rv { font-weight: 700; white-space: nowrap; }
.pl-rv-pass { color: #14532d; }
.pl-rv-warn { color: #7a4a00; }
.pl-rv-fail { color: #9b1c1c; }
.pl-rv-na { color: #3a434b; }
.pl-report-stamp {
  display: inline-block; font-size: 1.4rem; font-weight: 800; letter-spacing: 0.06em; padding: 6px 16px;
  border: 4px solid currentColor; border-radius: 6px; margin: 4px 0 8px;
}
.pl-report-stamp-pass { color: #14532d; }
.pl-report-stamp-fail { color: #9b1c1c; }
.pl-report-plotgrid { display: grid; grid-template-columns: repeat(2, minmax(0, 1fr)); gap: 12px; }
@media (max-width: 640px) {
  .pl-report-plotgrid { grid-template-columns: minmax(0, 1fr); }
  .pl-report { padding: 12px; margin: 0; border: 0; }
  .pl-report-sec { overflow-x: auto; }
  .pl-rt { font-size: 0.85rem; }
  .pl-rt th, .pl-rt td { padding: 3px 4px; }
  .pl-rt td:last-child { min-width: 11em; }
}
.pl-report-plot { margin: 0; }
.pl-report-plot figcaption { font-weight: 600; font-size: 0.92rem; margin-bottom: 2px; }
.pl-report-plot svg.pl-plot-svg { display: block; width: 100%; height: auto; }
.pl-report-caution { border: 3px solid #7a4a00; border-radius: 6px; padding: 8px 12px; background: #fffbea; }
.pl-report-caution h2 { border-bottom-color: #7a4a00; }
.pl-report-foot { margin-top: 18px; border-top: 1px solid #c3c9cd; padding-top: 6px; }
body.pl-report-file { margin: 0; background: #e9e6df; }

@media print {
  @page { size: A4; margin: 14mm 12mm; }
  html, body { background: #fff !important; }
  .pl-report-view { background: #fff; }
  .pl-report-sec { overflow: visible; }
  .pl-report-tools { display: none; }
  .pl-report { max-width: none; margin: 0; padding: 0; border: 0; font-size: 10.5pt; }
  .pl-report-sec { break-inside: auto; }
  .pl-report h2, .pl-report h3 { break-after: avoid; }
  .pl-rt tr, .pl-report-plot, .pl-report-stamp, .pl-report-caution { break-inside: avoid; }
  .pl-report-plotgrid { grid-template-columns: repeat(2, minmax(0, 1fr)); }
  body.pl-report-file { background: #fff; }
}
`
