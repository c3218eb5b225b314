// Filters of findings.html over findings/data.js, written by gibbsite.
// Rows are read as data and written as text: nothing from the model ever
// becomes markup. Without JavaScript the filter stays hidden and the
// grouped view and the full list work as they are.
(function () {
  "use strict";
  var LIMIT = 200;
  // Which values of a row (see data.js) each filter matches.
  var FIELDS = {
    severity: function (r) { return [r[0]]; },
    kind: function (r) { return [r[1]]; },
    cause: function (r) { return r[2] ? [String(r[2])] : []; },
    group: function (r) { return r[4]; },
    compartment: function (r) { return r[3]; }
  };
  var ORDER = { error: 0, warning: 1, note: 2 };

  function start() {
    var data = window.gibbsiteFindings;
    var section = document.getElementById("filter");
    var form = document.getElementById("finding-filter");
    var count = document.getElementById("filter-count");
    var list = document.getElementById("filter-results");
    if (!data || !section || !form || !count || !list) return;
    var rows = data.rows;
    Object.keys(FIELDS).forEach(function (name) {
      var select = form.elements[name];
      var seen = {};
      rows.forEach(function (r) {
        FIELDS[name](r).forEach(function (v) { seen[v] = true; });
      });
      var values = Object.keys(seen).sort(function (a, b) {
        if (name === "cause") return Number(a) - Number(b);
        if (name === "severity") return ORDER[a] - ORDER[b];
        return a < b ? -1 : a > b ? 1 : 0;
      });
      values.forEach(function (v) {
        var option = document.createElement("option");
        option.value = v;
        option.textContent = name === "cause" ? v + ". " + data.causes[Number(v) - 1] : v;
        select.appendChild(option);
      });
      select.disabled = values.length === 0;
      select.addEventListener("change", update);
    });
    section.hidden = false;
    update();

    function update() {
      var chosen = {};
      var any = false;
      Object.keys(FIELDS).forEach(function (name) {
        var v = form.elements[name].value;
        if (v) { chosen[name] = v; any = true; }
      });
      while (list.firstChild) list.removeChild(list.firstChild);
      if (!any) {
        count.textContent = "Choose a severity, kind, cause, group or compartment to list the matching findings.";
        return;
      }
      var hits = rows.filter(function (r) {
        return Object.keys(chosen).every(function (name) {
          return FIELDS[name](r).indexOf(chosen[name]) >= 0;
        });
      });
      count.textContent = hits.length + (hits.length === 1 ? " finding matches" : " findings match") +
        (hits.length > LIMIT ? "; the first " + LIMIT + " are listed." : ".");
      hits.slice(0, LIMIT).forEach(function (r) {
        var item = document.createElement("li");
        var sev = document.createElement("span");
        sev.className = "sev sev-" + r[0];
        sev.textContent = r[0];
        item.appendChild(sev);
        item.appendChild(document.createTextNode(" " + r[1] + " · " + r[5] + (r[6] ? " (" + r[6] + ")" : "") + ": " + r[7] + " "));
        var link = document.createElement("a");
        link.className = "more";
        link.href = "findings/" + r[8];
        link.textContent = "in the list";
        item.appendChild(link);
        list.appendChild(item);
      });
    }
  }

  if (document.readyState === "loading") {
    document.addEventListener("DOMContentLoaded", start);
  } else {
    start();
  }
})();
