/**
 * The archive index: one table row per shot report in a directory, built from each report's embedded
 * JSON (never from its HTML text), sortable by any column and filterable, self-contained like the reports.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { readEmbedded, type EmbeddedReport } from './embedded.js';
import { escapeHtml } from './escape.js';
import { formatPercent, formatQuantity, formatScientific } from './format.js';
import { pageStart } from './styles.js';

export interface ArchiveEntry {
  /** file name of the report, relative to the index */
  fileName: string;
  report: EmbeddedReport;
}

export interface ArchiveScan {
  entries: ArchiveEntry[];
  /** one line per skipped file */
  warnings: string[];
}

/** Read every *.html report in `dir` (not index.html); files that are not reports are skipped with a warning. */
export function scanReports(dir: string): ArchiveScan {
  const names = readdirSync(dir, { withFileTypes: true })
    .filter((d) => d.isFile() && /\.html?$/i.test(d.name) && d.name.toLowerCase() !== 'index.html')
    .map((d) => d.name)
    .sort();
  const entries: ArchiveEntry[] = [];
  const warnings: string[] = [];
  for (const fileName of names) {
    try {
      entries.push({ fileName, report: readEmbedded(readFileSync(join(dir, fileName), 'utf8')) });
    } catch (error) {
      warnings.push(`${fileName}: skipped, not a railpulse shot report (${(error as Error).message})`);
    }
  }
  return { entries, warnings };
}

/** "2026-12-02T09:00:00.000Z" → "2026-12-02 09:00"; still sorts as text; other strings are shown as given. */
function shortDate(iso: string): string {
  const match = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2})/.exec(iso);
  return match ? `${match[1]} ${match[2]}` : iso;
}

interface Column {
  key: string;
  title: string;
  numeric: boolean;
  cell: (entry: ArchiveEntry) => { html: string; si?: number | null };
}

const COLUMNS: Column[] = [
  { key: 'name', title: 'Scenario', numeric: false, cell: (e) => ({ html: escapeHtml(e.report.scenarioName) }) },
  { key: 'date', title: 'Date (UTC)', numeric: false, cell: (e) => ({ html: escapeHtml(shortDate(e.report.provenance.date)) }) },
  { key: 'outcome', title: 'Outcome', numeric: false, cell: (e) => ({ html: escapeHtml(e.report.results.outcome) }) },
  {
    key: 'muzzleVelocity',
    title: 'Muzzle velocity',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.results.muzzleVelocity, 'm/s', { prefix: false }), si: e.report.results.muzzleVelocity }),
  },
  {
    key: 'efficiency',
    title: 'Efficiency',
    numeric: true,
    cell: (e) => ({ html: formatPercent(e.report.results.efficiency), si: e.report.results.efficiency }),
  },
  {
    key: 'peakCurrent',
    title: 'Peak current',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.results.peakCurrent, 'A'), si: e.report.results.peakCurrent }),
  },
  {
    key: 'peakAcceleration',
    title: 'Peak acceleration',
    numeric: true,
    cell: (e) => ({ html: formatScientific(e.report.results.peakAcceleration, 'm/s\u00B2'), si: e.report.results.peakAcceleration }),
  },
  {
    key: 'actionIntegral',
    title: 'Action \u222BI\u00B2dt',
    numeric: true,
    cell: (e) => ({ html: formatScientific(e.report.results.actionIntegral, 'A\u00B2\u00B7s'), si: e.report.results.actionIntegral }),
  },
  {
    key: 'initialEnergy',
    title: 'Stored E0',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.results.energy.initial, 'J'), si: e.report.results.energy.initial }),
  },
  {
    key: 'warnings',
    title: 'Warnings',
    numeric: true,
    cell: (e) => ({ html: String(e.report.warnings.length), si: e.report.warnings.length }),
  },
  {
    key: 'file',
    title: 'Report',
    numeric: false,
    cell: (e) => ({ html: `<a href="${escapeHtml(encodeURIComponent(e.fileName))}">${escapeHtml(e.fileName)}</a>` }),
  },
];

function row(entry: ArchiveEntry, index: number): string {
  const cells = COLUMNS.map((column) => {
    const { html, si } = column.cell(entry);
    const siAttribute = column.numeric && typeof si === 'number' && Number.isFinite(si) ? ` data-si="${si}"` : '';
    return `<td data-column="${column.key}"${column.numeric ? ' class="num"' : ''}${siAttribute}>${html}</td>`;
  }).join('');
  return `<tr data-index="${index}">${cells}</tr>`;
}

/** Sort on header click (numbers by data-si, text otherwise; ties keep their order) and filter by text. */
const TABLE_SCRIPT = `(function () {
  var table = document.getElementById('reports');
  var body = table.tBodies[0];
  var headers = Array.prototype.slice.call(table.tHead.rows[0].cells);
  function key(row, col, numeric) {
    var cell = row.cells[col];
    if (!numeric) return cell.textContent.trim().toLowerCase();
    var si = cell.getAttribute('data-si');
    return si === null ? NaN : Number(si);
  }
  function sortBy(th) {
    var col = headers.indexOf(th);
    var numeric = th.getAttribute('data-type') === 'number';
    var direction = th.getAttribute('aria-sort') === 'ascending' ? 'descending' : 'ascending';
    var sign = direction === 'ascending' ? 1 : -1;
    headers.forEach(function (h) { h.removeAttribute('aria-sort'); });
    th.setAttribute('aria-sort', direction);
    var rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (a, b) {
      var x = key(a, col, numeric), y = key(b, col, numeric), order;
      if (numeric) {
        if (isNaN(x) || isNaN(y)) order = isNaN(x) && isNaN(y) ? 0 : (isNaN(x) ? 1 : -1) * sign;
        else order = x - y;
      } else order = x < y ? -1 : x > y ? 1 : 0;
      return sign * order || Number(a.getAttribute('data-index')) - Number(b.getAttribute('data-index'));
    });
    rows.forEach(function (r) { body.appendChild(r); });
  }
  headers.forEach(function (th) {
    th.addEventListener('click', function () { sortBy(th); });
    th.addEventListener('keydown', function (event) { if (event.key === 'Enter' || event.key === ' ') { event.preventDefault(); sortBy(th); } });
  });
  var filter = document.getElementById('filter');
  var count = document.getElementById('shown');
  filter.addEventListener('input', function () {
    var words = filter.value.toLowerCase().split(/\\s+/).filter(Boolean);
    var shown = 0;
    Array.prototype.forEach.call(body.rows, function (r) {
      var text = r.textContent.toLowerCase();
      var match = words.every(function (w) { return text.indexOf(w) >= 0; });
      r.hidden = !match;
      if (match) shown++;
    });
    count.textContent = String(shown);
  });
})();`;

export interface ArchiveOptions {
  title?: string;
}

/** The index page. Rows start newest first (by provenance date, then file name). */
export function buildArchiveIndex(entries: ArchiveEntry[], options: ArchiveOptions = {}): string {
  const title = options.title ?? 'Shot archive';
  const ordered = [...entries].sort(
    (a, b) =>
      (a.report.provenance.date < b.report.provenance.date ? 1 : a.report.provenance.date > b.report.provenance.date ? -1 : 0) ||
      (a.fileName < b.fileName ? -1 : a.fileName > b.fileName ? 1 : 0),
  );
  const headers = COLUMNS.map(
    (c) =>
      `<th scope="col" class="sortable${c.numeric ? ' num' : ''}" tabindex="0" data-column="${c.key}" data-type="${c.numeric ? 'number' : 'text'}">${escapeHtml(c.title)}</th>`,
  ).join('');
  const rows = ordered.map(row).join('\n');
  return `${pageStart(`${title} \u2014 railpulse`, { generator: ARCHIVE_INDEX_GENERATOR })}
</head>
<body>
<main class="wide">
<header><p class="kicker">railpulse \u00B7 archive index</p><h1>${escapeHtml(title)}</h1>
<p class="description">Simulated shots in this folder, read from the data embedded in each report. Click a column header to sort; type to filter.</p></header>
<div class="filter"><label for="filter">Filter</label><input id="filter" type="search" placeholder="scenario, outcome, date …" autocomplete="off">
<span><span id="shown">${ordered.length}</span> of ${ordered.length} reports</span></div>
<div class="scroll"><table id="reports" class="archive"><thead><tr>${headers}</tr></thead>
<tbody>
${rows}
</tbody></table></div>
<p class="note">Model results, not measurements. A charged capacitor bank stores lethal energy: each report carries its safety notes; follow your institution's high-voltage safety rules.</p>
</main>
<script>${TABLE_SCRIPT}</script>
</body>
</html>
`;
}

/** The generator an index page names in its head: `index` replaces an index.html only when it carries this mark. */
export const ARCHIVE_INDEX_GENERATOR = 'railpulse index';

/** Whether an existing page is an archive index railpulse wrote (its generator meta element). */
export function isArchiveIndex(html: string): boolean {
  return /<meta\s+name="generator"\s+content="railpulse index"\s*\/?>/i.test(html.slice(0, 4096));
}
