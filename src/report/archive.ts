/**
 * The archive index: one table row per shot report in a directory, built from each report's embedded
 * JSON (never from its HTML text), sortable by any column and filterable, self-contained like the reports.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { statusOf, type ShotStatus } from '../checks/assess.js';
import { HAZARD_CLASS_NAMES, type BankHazard } from '../checks/hazard.js';
import { statusSentence } from '../output/verdicts.js';
import { formatPercent, formatQuantity } from '../units/format.js';
import { readEmbedded, type EmbeddedReport } from './embedded.js';
import { escapeHtml } from './escape.js';
import { safetyBanner, safetyProcedures, type BankOnPage } from './safety.js';
import { DATE_SCRIPT, pageStart } from './styles.js';

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

/** "2026-12-02T09:00:00.000Z" → "2026-12-02 09:00 UTC"; other strings are shown as given. */
function shortDate(iso: string): string {
  const match = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2})/.exec(iso);
  return match ? `${match[1]} ${match[2]} UTC` : iso;
}

/** The status a record shows: the one it carries, or (older records) the same computation on its checks and warnings. */
export function recordStatus(report: EmbeddedReport): ShotStatus {
  return report.status ?? statusOf(report.checks, report.warnings);
}

const STATUS_RANK = { pass: 0, warn: 1, fail: 2 } as const;

interface Column {
  key: string;
  title: string;
  numeric: boolean;
  cell: (entry: ArchiveEntry) => { html: string; si?: number | null; sortKey?: string };
}

const filed = (key: 'shotId' | 'operator' | 'reviewer' | 'notes') => (e: ArchiveEntry) => ({ html: escapeHtml(e.report.record?.[key] ?? '') });

function hazardText(hazard: BankHazard | undefined): string {
  if (!hazard) return '';
  return hazard.classes.length ? hazard.classes.map((c) => HAZARD_CLASS_NAMES[c].replace(/ hazard$/, '')).join(', ') : 'below classes';
}

const COLUMNS: Column[] = [
  {
    key: 'status',
    title: 'Status',
    numeric: true,
    cell: (e) => {
      const status = recordStatus(e.report);
      return {
        html: `<span class="verdict verdict-${status.verdict}" title="${escapeHtml(statusSentence(status))}">${status.verdict}</span><div class="note">${status.checks.fail} fail, ${status.checks.warn} warn, ${status.warnings} warning${status.warnings === 1 ? '' : 's'}</div>`,
        si: STATUS_RANK[status.verdict],
      };
    },
  },
  { key: 'shotId', title: 'Shot', numeric: false, cell: filed('shotId') },
  { key: 'name', title: 'Scenario', numeric: false, cell: (e) => ({ html: escapeHtml(e.report.scenarioName) }) },
  {
    key: 'date',
    title: 'Date',
    numeric: false,
    cell: (e) => ({
      html: `<time datetime="${escapeHtml(e.report.provenance.date)}">${escapeHtml(shortDate(e.report.provenance.date))}</time><div class="note local-date" data-local-date="${escapeHtml(e.report.provenance.date)}"></div>`,
      sortKey: e.report.provenance.date,
    }),
  },
  { key: 'operator', title: 'Operator', numeric: false, cell: filed('operator') },
  { key: 'reviewer', title: 'Reviewer', numeric: false, cell: filed('reviewer') },
  { key: 'outcome', title: 'Outcome', numeric: false, cell: (e) => ({ html: escapeHtml(e.report.results.outcome) }) },
  {
    key: 'muzzleVelocity',
    title: 'Muzzle velocity',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.results.muzzleVelocity, 'm/s'), si: e.report.results.muzzleVelocity }),
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
    cell: (e) => ({ html: formatQuantity(e.report.results.peakAcceleration, 'm/s\u00B2'), si: e.report.results.peakAcceleration }),
  },
  {
    key: 'actionIntegral',
    title: 'Action \u222BI\u00B2dt',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.results.actionIntegral, 'A\u00B2\u00B7s'), si: e.report.results.actionIntegral }),
  },
  {
    key: 'initialEnergy',
    title: 'Stored E0',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.results.energy.initial, 'J'), si: e.report.results.energy.initial }),
  },
  {
    key: 'maxChargeVoltage',
    title: 'Highest V0',
    numeric: true,
    cell: (e) => ({ html: formatQuantity(e.report.hazard?.maxChargeVoltage, 'V'), si: e.report.hazard?.maxChargeVoltage ?? null }),
  },
  { key: 'hazard', title: 'Hazard class', numeric: false, cell: (e) => ({ html: escapeHtml(hazardText(e.report.hazard)) }) },
  {
    key: 'warnings',
    title: 'Warnings',
    numeric: true,
    cell: (e) => ({ html: String(e.report.warnings.length), si: e.report.warnings.length }),
  },
  { key: 'notes', title: 'Notes', numeric: false, cell: filed('notes') },
  {
    key: 'file',
    title: 'Record',
    numeric: false,
    cell: (e) => ({ html: `<a href="${escapeHtml(encodeURIComponent(e.fileName))}">${escapeHtml(e.fileName)}</a>` }),
  },
];

function row(entry: ArchiveEntry, index: number): string {
  const cells = COLUMNS.map((column) => {
    const { html, si, sortKey } = column.cell(entry);
    const siAttribute = column.numeric && typeof si === 'number' && Number.isFinite(si) ? ` data-si="${si}"` : '';
    const keyAttribute = sortKey === undefined ? '' : ` data-key="${escapeHtml(sortKey)}"`;
    return `<td data-column="${column.key}"${column.numeric ? ' class="num"' : ''}${siAttribute}${keyAttribute}>${html}</td>`;
  }).join('');
  return `<tr data-index="${index}">${cells}</tr>`;
}

/** Sort on header click (numbers by data-si, text otherwise; ties keep their order) and filter by text. */
const TABLE_SCRIPT = `${DATE_SCRIPT}
(function () {
  var table = document.getElementById('reports');
  var body = table.tBodies[0];
  var headers = Array.prototype.slice.call(table.tHead.rows[0].cells);
  function key(row, col, numeric) {
    var cell = row.cells[col];
    if (!numeric) return (cell.getAttribute('data-key') || cell.textContent).trim().toLowerCase();
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

/** The bank of each record for the safety banner (older records lack it: their stored energy alone). */
function archiveBanks(entries: readonly ArchiveEntry[]): BankOnPage[] {
  return entries.map((e) => ({
    name: e.report.record?.shotId ? `${e.report.record.shotId}: ${e.report.scenarioName}` : e.report.scenarioName,
    hazard: e.report.hazard ?? { storedEnergy: e.report.results.energy.initial, maxChargeVoltage: 0, classes: [] },
  }));
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
  const banks = archiveBanks(ordered);
  const counts = { pass: 0, warn: 0, fail: 0 };
  for (const e of ordered) counts[recordStatus(e.report).verdict] += 1;
  return `${pageStart(`${title} \u2014 railpulse`, { generator: ARCHIVE_INDEX_GENERATOR })}
</head>
<body>
<main class="wide">
<header><p class="kicker">railpulse \u00B7 archive index</p><h1>${escapeHtml(title)}</h1>
<p class="description">Simulated shots in this folder, read from the data embedded in each record. Click a column header to sort; type to filter.</p></header>
${safetyBanner(banks, banks.length === 1 ? 'this bank' : 'the banks of these records')}
<p id="archive-status" data-fail="${counts.fail}" data-warn="${counts.warn}" data-pass="${counts.pass}">Status of the records (the worst of each shot's checks and warnings): <span class="verdict verdict-fail">${counts.fail} fail</span>, <span class="verdict verdict-warn">${counts.warn} warn</span>, <span class="verdict verdict-pass">${counts.pass} pass</span>.</p>
<div class="filter"><label for="filter">Filter</label><input id="filter" type="search" placeholder="scenario, shot, operator, status, date …" autocomplete="off">
<span><span id="shown">${ordered.length}</span> of ${ordered.length} records</span></div>
<div class="scroll"><table id="reports" class="archive"><thead><tr>${headers}</tr></thead>
<tbody>
${rows}
</tbody></table></div>
<p class="note">Model results, not measurements.</p>
${safetyProcedures(banks.length === 1 ? banks : [])}
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
