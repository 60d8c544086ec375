"""The report's stylesheet and in-page script: self-contained, no network, print-ready."""

from __future__ import annotations

__all__ = ["SCRIPT", "STYLE"]

STYLE = """
body { font-family: sans-serif; margin: 1.5em; max-width: 90em; line-height: 1.35; }
h1 { font-size: 1.6em; } h2 { border-bottom: 2px solid #333; margin-top: 1.6em; }
table { border-collapse: collapse; font-size: 0.88em; margin: 0.4em 0; }
td, th { padding: 0.2em 0.5em; border-bottom: 1px solid #ccc; text-align: left;
         vertical-align: top; overflow-wrap: break-word; }
th { background: #eee; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
.caution { border: 2px solid #333; padding: 0.6em; }
.note { font-size: 0.85em; color: #333; }
.scroll { overflow-x: auto; max-width: 100%; }
tr.fail td, td.fail { font-weight: bold; }
tr.ne td, td.ne { font-style: italic; }
.bar { display: inline-block; width: 6em; height: 0.8em; border: 1px solid #555;
       vertical-align: middle; }
.bar span { display: block; height: 100%; }
nav.contents ol { columns: 2; }
.counts td, .counts th { font-size: 1.05em; }
figure.drawing { margin: 0.5em 0; }
svg.frame { width: 100%; max-width: 60em; height: auto; border: 1px solid #bbb; background: #fff; }
svg.frame polyline { fill: none; stroke-linecap: round; stroke-linejoin: round; }
svg.frame polyline.casing { stroke: #222; }
svg.frame a:hover polyline.member, svg.frame a:focus polyline.member { stroke-opacity: 0.6; }
svg.frame text { font-size: 12px; paint-order: stroke; stroke: #fff; stroke-width: 3px; }
svg.frame text.mark { font-weight: bold; }
svg.frame text.name { display: none; }
body.labels svg.frame text.name { display: inline; }
svg.legend { width: 100%; max-width: 46em; height: auto; font-size: 11px; }
svg.histogram { width: 100%; max-width: 40em; height: auto; font-size: 11px; }
.diagrams { display: flex; flex-wrap: wrap; gap: 0.5em; }
svg.diagram { width: 19em; height: auto; font-size: 10px; }
svg.interaction { width: 19em; height: auto; font-size: 10px; }
.sheet { border-top: 3px double #333; margin-top: 2em; }
.facts { display: grid; grid-template-columns: repeat(auto-fit, minmax(28em, 1fr)); gap: 1em; }
.checks { columns: 26em; column-gap: 1.5em; }
.check { break-inside: avoid; }
.check h5 { font-size: 1em; margin: 0.8em 0 0.2em 0; }
.check p { margin: 0.2em 0; }
.sheet:target { outline: 3px solid #3e4989; outline-offset: 4px; }
table.compact { font-size: 0.82em; }
.filters input, .filters select, button { font-size: 1em; margin-right: 0.8em; }
table.sortable th { cursor: pointer; }
table.sortable th[aria-sort=ascending]::after { content: " \\25B2"; }
table.sortable th[aria-sort=descending]::after { content: " \\25BC"; }
@page { size: @PAPER@ landscape; margin: 12mm; }
@media print {
  body { margin: 0; max-width: none; font-size: 8pt; }
  .checks { columns: 3; column-gap: 1em; }
  .facts { grid-template-columns: 1fr 1fr; }
  .noprint, .filters { display: none; }
  .scroll { overflow: visible; }
  table { width: 100%; table-layout: auto; }
  td, th { overflow-wrap: anywhere; word-break: break-word; }
  thead { display: table-header-group; }
  tr, .check, svg, figure { break-inside: avoid; }
  h2, h3, h4, h5 { break-after: avoid; }
  .sheet { break-before: page; border-top: none; }
  svg.frame text.name { display: inline; }
  svg.frame { max-width: 100%; border: none; }
  a { color: inherit; text-decoration: none; }
}
"""

SCRIPT = """
(function () {
  function key(cell) {
    var v = cell.getAttribute('data-sort');
    if (v === null) { v = cell.textContent.trim(); }
    var n = Number(v);
    return (v !== '' && !isNaN(n)) ? [0, n] : [v === '' ? 2 : 1, v.toLowerCase()];
  }
  function compare(a, b) {
    if (a[0] !== b[0]) { return a[0] - b[0]; }
    return a[1] < b[1] ? -1 : (a[1] > b[1] ? 1 : 0);
  }
  function sortBy(table, index, th) {
    var ascending = th.getAttribute('aria-sort') !== 'ascending';
    Array.prototype.forEach.call(table.tHead.rows[0].cells, function (h) {
      h.removeAttribute('aria-sort'); });
    th.setAttribute('aria-sort', ascending ? 'ascending' : 'descending');
    var body = table.tBodies[0];
    var rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (r, s) {
      var a = key(r.cells[index]), b = key(s.cells[index]);
      if (a[0] !== b[0]) { return a[0] - b[0]; }  /* blanks last either way */
      var c = compare(a, b);
      return ascending ? c : -c;
    });
    rows.forEach(function (r) { body.appendChild(r); });
  }
  document.querySelectorAll('table.sortable').forEach(function (table) {
    Array.prototype.forEach.call(table.tHead.rows[0].cells, function (th, i) {
      th.setAttribute('tabindex', '0');
      th.addEventListener('click', function () { sortBy(table, i, th); });
      th.addEventListener('keydown', function (e) {
        if (e.key === 'Enter') { sortBy(table, i, th); } });
    });
  });
  var text = document.getElementById('member-filter');
  var status = document.getElementById('status-filter');
  function filter() {
    var q = text ? text.value.trim().toLowerCase() : '';
    var s = status ? status.value : '';
    var shown = 0;
    document.querySelectorAll('#members-table tbody tr').forEach(function (r) {
      var ok = (!q || r.textContent.toLowerCase().indexOf(q) >= 0) &&
               (!s || r.getAttribute('data-status') === s);
      r.style.display = ok ? '' : 'none';
      if (ok) { shown += 1; }
    });
    var count = document.getElementById('members-shown');
    if (count) { count.textContent = shown; }
  }
  if (text) { text.addEventListener('input', filter); }
  if (status) { status.addEventListener('change', filter); }
  var labels = document.getElementById('toggle-labels');
  if (labels) { labels.addEventListener('click', function () {
    document.body.classList.toggle('labels'); }); }
})();
"""
