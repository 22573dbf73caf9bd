import { readableUtcDate } from '../units/format.js';
import { escapeHtml } from './escape.js';
/**
 * Page style shared by the shot report and the archive index: a plain, print-friendly record.
 * Black on white, thin rules, one accent colour; nothing that needs a font or image from outside.
 */
export const RECORD_CSS = `
*{box-sizing:border-box}
html{font-family:"Helvetica Neue",Helvetica,Arial,sans-serif;font-size:14px;color:#111;background:#f4f4f1}
body{margin:0}
main{max-width:1120px;margin:0 auto;padding:28px 36px 48px;background:#fff;border-left:1px solid #d8d8d2;border-right:1px solid #d8d8d2}
main.wide{max-width:1480px}
table.archive td{white-space:nowrap}
table.archive td[data-column=name]{white-space:normal;min-width:9em}
table.archive td[data-column=file]{white-space:normal;word-break:break-all;min-width:10em}
table.archive td,table.archive th{padding:4px 6px}
table.archive th{white-space:nowrap}
.scroll{overflow-x:auto}
h1{font-size:26px;margin:4px 0 6px;font-weight:700;letter-spacing:-.01em}
h2{font-size:17px;margin:34px 0 10px;padding-bottom:4px;border-bottom:2px solid #111;font-weight:700}
h3{font-size:14px;margin:22px 0 6px}
p{line-height:1.5;margin:6px 0}
.kicker{font-size:11px;letter-spacing:.14em;text-transform:uppercase;color:#555;margin:0}
.description{color:#333;max-width:80ch}
.meta{display:flex;flex-wrap:wrap;gap:4px 22px;font-size:12px;color:#444;margin-top:10px;padding-top:8px;border-top:1px solid #ccc}
.meta b{color:#111;font-weight:600}
.outcome{display:inline-block;font-size:12px;font-weight:700;letter-spacing:.06em;text-transform:uppercase;padding:2px 8px;border:1.5px solid currentColor;border-radius:2px;vertical-align:middle}
.outcome-exited{color:#1d5e20}.outcome-stalled,.outcome-timeout{color:#9c1c1c}
.figures{display:grid;grid-template-columns:repeat(auto-fill,minmax(190px,1fr));gap:0;border-top:1px solid #bbb;border-left:1px solid #bbb;margin:14px 0 0}
.figure{border-right:1px solid #bbb;border-bottom:1px solid #bbb;padding:9px 12px 10px;margin:0}
.figure dt{font-size:11px;text-transform:uppercase;letter-spacing:.06em;color:#555}
.figure dd{margin:3px 0 0;font-size:19px;font-weight:600;font-variant-numeric:tabular-nums}
.figure .aside{display:block;font-size:12px;font-weight:400;color:#444;margin-top:2px}
.warnings{border:2px solid #9c1c1c;background:#fff6f4;padding:10px 16px 10px 16px;margin:18px 0 0}
.warnings h2{border:0;margin:0 0 4px;padding:0;color:#9c1c1c;font-size:15px}
.warnings ul{margin:4px 0;padding-left:20px}.warnings li{margin:4px 0;line-height:1.45}
.no-warnings{margin:18px 0 0;padding:8px 14px;border:1px solid #9bb59c;background:#f5faf5;color:#1d5e20}
.safety{border:2px solid #111;padding:4px 18px 12px;margin-top:30px;background:#fffbea}
.safety-banner{border:2px solid #111;border-left-width:8px;background:#fffbea;padding:8px 14px;margin:14px 0 0;font-size:13.5px;line-height:1.5}
.safety-banner p{margin:0}.safety-banner a{color:#111}
.status{border:2px solid;padding:8px 14px 8px;margin:12px 0 0}
.status h2{border:0;margin:0;padding:0;font-size:15px}
.status ul{margin:4px 0;padding-left:20px}.status li{margin:3px 0;line-height:1.45}
.status-pass{border-color:#1d5e20;background:#f5faf5}.status-pass h2{color:#1d5e20}
.status-warn{border-color:#8a5a00;background:#fff8e6}.status-warn h2{color:#8a5a00}
.status-fail{border-color:#9c1c1c;background:#fff6f4}.status-fail h2{color:#9c1c1c}
.badge{display:inline-block;font-size:12px;font-weight:700;letter-spacing:.06em;text-transform:uppercase;padding:1px 7px;border:1.5px solid currentColor;border-radius:2px;margin-right:6px}
.local-date{color:#555}
tr.section-head th{background:#efefea;border-bottom:1px solid #999;font-weight:700;padding-top:8px}
td.key{font-family:"DejaVu Sans Mono",Menlo,Consolas,monospace;font-size:12px;padding-left:18px}
.safety h2{border-bottom:1px solid #111;margin-top:12px}
.safety .lead{font-size:15px}
.plot-block{margin:18px 0 26px;break-inside:avoid;page-break-inside:avoid}
.plot-block h3{margin-bottom:2px}
.plot-block .caption{font-size:12px;color:#444;margin:0 0 4px}
.plot{width:100%;min-height:220px}
table{border-collapse:collapse;width:100%;font-size:12.5px;margin:8px 0}
th,td{border-bottom:1px solid #d5d5d5;padding:4px 8px;text-align:left;vertical-align:top}
th{border-bottom:1.5px solid #111;font-weight:600;background:#fafaf8}
td.num,th.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
td.path,code{font-family:"DejaVu Sans Mono",Menlo,Consolas,monospace;font-size:12px}
td.default{color:#777;font-style:italic}
.verdict{font-weight:700;text-transform:uppercase;font-size:11px;letter-spacing:.05em}
.verdict-pass{color:#1d5e20}.verdict-warn{color:#8a5a00}.verdict-fail{color:#9c1c1c}.verdict-info{color:#555}
.note{font-size:12px;color:#444}
dl.provenance{display:grid;grid-template-columns:max-content 1fr;gap:3px 18px;font-size:12.5px}
dl.provenance dt{color:#555}dl.provenance dd{margin:0;font-family:"DejaVu Sans Mono",Menlo,Consolas,monospace;word-break:break-all}
footer{margin-top:36px;padding-top:8px;border-top:1px solid #999;font-size:11.5px;color:#555}
.filter{margin:10px 0;display:flex;gap:8px;align-items:center}
.filter input{font:inherit;padding:4px 8px;border:1px solid #888;min-width:280px}
th.sortable{cursor:pointer;user-select:none}th.sortable:after{content:" \\2195";color:#999}
th[aria-sort=ascending]:after{content:" \\25B2";color:#111}th[aria-sort=descending]:after{content:" \\25BC";color:#111}
@media print{
  html{background:#fff;font-size:11pt}
  main{max-width:none;padding:0;border:0}
  .modebar,.filter{display:none!important}
  h2{break-after:avoid;page-break-after:avoid}
  .safety,.safety-banner,.status,.warnings,table,tr{break-inside:avoid;page-break-inside:avoid}
  a{color:#111;text-decoration:none}
}
`;

/** The Content-Security-Policy every generated page carries: nothing may be fetched from anywhere. */
export const RECORD_CSP = "default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; img-src data:";

/**
 * The opening of every railpulse page up to its styles: doctype, the CSP that forbids network access, the
 * generator and the (escaped) title. The caller adds its embedded data and closes the head.
 */
export function pageStart(title: string, options: { generator?: string; css?: string } = {}): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${RECORD_CSP}">
<meta name="viewport" content="width=device-width, initial-scale=1">
${options.generator ? `<meta name="generator" content="${escapeHtml(options.generator)}">\n` : ''}<title>${escapeHtml(title)}</title>
<style>${RECORD_CSS}${options.css ?? ''}</style>`;
}

/**
 * A date as stored (ISO 8601, UTC) and beside it in words: in UTC in the file (so the same input gives the same
 * bytes), replaced by the reader's local time when the page opens (DATE_SCRIPT).
 */
export function dateHtml(iso: string): string {
  return `<time datetime="${escapeHtml(iso)}" data-date>${escapeHtml(iso)}</time> <span class="local-date" data-local-date="${escapeHtml(iso)}">(${escapeHtml(readableUtcDate(iso))})</span>`;
}

/** Puts every [data-local-date] in the reader's local time and zone. Plain ES5 text, run by every page. */
export const DATE_SCRIPT = `(function () {
  var options = { weekday: 'short', year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', timeZoneName: 'short' };
  Array.prototype.forEach.call(document.querySelectorAll('[data-local-date]'), function (element) {
    var date = new Date(element.getAttribute('data-local-date'));
    if (!isNaN(date.getTime())) element.textContent = '(' + date.toLocaleString(undefined, options) + ')';
  });
})();`;
