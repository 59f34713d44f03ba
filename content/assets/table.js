// Sorting and filtering for the reference table. The table is complete
// without this file; the script only adds sort buttons to the headers and
// shows the filter box.
(function () {
  "use strict";
  var table = document.getElementById("reference-table");
  if (!table || !table.tBodies[0]) return;
  var body = table.tBodies[0];
  var rows = Array.prototype.slice.call(body.rows);
  var headers = Array.prototype.slice.call(table.tHead.rows[0].cells);
  var texts = rows.map(function (row) { return row.textContent.toLowerCase(); });
  var tools = document.getElementById("table-tools");
  var filterBox = document.getElementById("table-filter");
  var statusBox = document.getElementById("table-status");
  var countOut = document.getElementById("table-count");

  function sortValue(row, column, numeric) {
    var cell = row.cells[column];
    if (!cell) return null;
    var raw = cell.hasAttribute("data-sort") ? cell.getAttribute("data-sort") : cell.textContent.trim();
    if (raw === "") return null;
    if (!numeric) return raw.toLowerCase();
    var x = Number(raw);
    return isNaN(x) ? null : x;
  }

  function sortBy(column, numeric, descending) {
    var keyed = rows.map(function (row, index) {
      return { row: row, index: index, value: sortValue(row, column, numeric) };
    });
    keyed.sort(function (a, b) {
      // rows without a value go last in either direction
      if (a.value === null || b.value === null) {
        return (a.value === null) - (b.value === null) || a.index - b.index;
      }
      var d = numeric ? a.value - b.value : a.value.localeCompare(b.value);
      if (descending) d = -d;
      return d || a.index - b.index;
    });
    var fragment = document.createDocumentFragment();
    keyed.forEach(function (k) { fragment.appendChild(k.row); });
    body.appendChild(fragment);
  }

  headers.forEach(function (th, column) {
    var type = th.getAttribute("data-sort-type");
    if (!type) return;
    var button = document.createElement("button");
    button.type = "button";
    button.className = "sort-button";
    button.setAttribute("data-sort-key", th.getAttribute("data-sort-key") || "");
    while (th.firstChild) button.appendChild(th.firstChild);
    th.appendChild(button);
    th.setAttribute("aria-sort", "none");
    button.addEventListener("click", function () {
      var descending = th.getAttribute("aria-sort") === "ascending";
      headers.forEach(function (other) {
        if (other.hasAttribute("aria-sort")) other.setAttribute("aria-sort", "none");
      });
      th.setAttribute("aria-sort", descending ? "descending" : "ascending");
      sortBy(column, type === "number", descending);
    });
  });

  function applyFilter() {
    var words = (filterBox.value || "").toLowerCase().split(/\s+/).filter(Boolean);
    var status = statusBox.value;
    var shown = 0;
    rows.forEach(function (row, i) {
      var ok = (!status || row.getAttribute("data-status") === status) &&
        words.every(function (w) { return texts[i].indexOf(w) !== -1; });
      row.hidden = !ok;
      if (ok) shown++;
    });
    countOut.textContent = shown + " of " + rows.length + " rows shown";
  }

  if (tools && filterBox && statusBox && countOut) {
    tools.hidden = false;
    filterBox.addEventListener("input", applyFilter);
    statusBox.addEventListener("change", applyFilter);
    applyFilter();
  }
})();
