// Optional enhancements for tables; every page reads fine without them.
// Tables with `data-sortable` get clickable column headers, tables with
// `data-filter` get a text box that hides rows not containing the text.
// A cell may carry `data-sort` with the value to sort by.
(function () {
  "use strict";

  function cellValue(row, index) {
    var cell = row.children[index];
    if (!cell) return "";
    return cell.hasAttribute("data-sort") ? cell.getAttribute("data-sort") : cell.textContent.trim();
  }

  function makeSortable(table) {
    var headers = table.tHead ? table.tHead.rows[0].cells : [];
    Array.prototype.forEach.call(headers, function (th, index) {
      var button = document.createElement("button");
      button.type = "button";
      button.className = "sort";
      while (th.firstChild) button.appendChild(th.firstChild);
      th.appendChild(button);
      var numeric = th.getAttribute("data-type") === "number";
      button.addEventListener("click", function () {
        var ascending = th.getAttribute("aria-sort") !== "ascending";
        Array.prototype.forEach.call(headers, function (h) { h.removeAttribute("aria-sort"); });
        th.setAttribute("aria-sort", ascending ? "ascending" : "descending");
        var body = table.tBodies[0];
        var rows = Array.prototype.slice.call(body.rows);
        rows.sort(function (a, b) {
          var x = cellValue(a, index), y = cellValue(b, index), order;
          if (numeric) {
            var nx = parseFloat(x), ny = parseFloat(y);
            // Rows without a number go last in both directions.
            if (isNaN(nx) || isNaN(ny)) return isNaN(nx) - isNaN(ny);
            order = nx - ny;
          } else {
            order = x.localeCompare(y, undefined, { numeric: true });
          }
          return ascending ? order : -order;
        });
        rows.forEach(function (row) { body.appendChild(row); });
      });
    });
  }

  function makeFilterable(table) {
    var label = document.createElement("label");
    label.className = "table-filter";
    label.textContent = "Filter rows: ";
    var input = document.createElement("input");
    input.type = "search";
    input.placeholder = "id, name, verdict…";
    label.appendChild(input);
    table.parentNode.insertBefore(label, table);
    input.addEventListener("input", function () {
      var needle = input.value.trim().toLowerCase();
      Array.prototype.forEach.call(table.tBodies[0].rows, function (row) {
        row.hidden = needle !== "" && row.textContent.toLowerCase().indexOf(needle) === -1;
      });
    });
  }

  document.addEventListener("DOMContentLoaded", function () {
    document.querySelectorAll("table[data-sortable]").forEach(makeSortable);
    document.querySelectorAll("table[data-filter]").forEach(makeFilterable);
  });
})();
