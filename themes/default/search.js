// Site-wide search: a box in the top bar that looks up reactions,
// metabolites, loops, scenarios and notes by id or name. The index is a
// script file (assets/search-index.js) loaded on first use, so search works
// from file:// without fetching anything. Without JavaScript there is no
// box and every page reads as before.
(function () {
  "use strict";
  var LIMIT = 20;

  function load(root, done) {
    if (window.gibbsiteSearch) return done();
    var script = document.createElement("script");
    script.src = root + "assets/search-index.js";
    script.onload = done;
    document.head.appendChild(script);
  }

  function rank(entry, needle) {
    var id = entry[1].toLowerCase(), name = entry[2].toLowerCase();
    if (id === needle || name === needle) return 0;
    if (id.indexOf(needle) === 0) return 1;
    if (name.indexOf(needle) === 0) return 2;
    return 3;
  }

  function find(query) {
    var needle = query.trim().toLowerCase();
    if (!needle || !window.gibbsiteSearch) return [];
    var words = needle.split(/\s+/);
    var hits = window.gibbsiteSearch.filter(function (e) {
      var hay = (e[1] + " " + e[2]).toLowerCase();
      return words.every(function (w) { return hay.indexOf(w) !== -1; });
    });
    hits.sort(function (a, b) {
      return rank(a, needle) - rank(b, needle) || a[1].length - b[1].length ||
        (a[1] < b[1] ? -1 : a[1] > b[1] ? 1 : 0);
    });
    return hits;
  }

  function show(list, root, hits) {
    while (list.firstChild) list.removeChild(list.firstChild);
    hits.slice(0, LIMIT).forEach(function (e) {
      var li = document.createElement("li");
      var a = document.createElement("a");
      a.href = root + e[3];
      a.textContent = e[1];
      var what = document.createElement("span");
      what.className = "what";
      what.textContent = e[0] + (e[2] ? " · " + e[2] : "");
      a.appendChild(what);
      li.appendChild(a);
      list.appendChild(li);
    });
    if (hits.length > LIMIT) {
      var more = document.createElement("li");
      more.className = "what";
      more.textContent = (hits.length - LIMIT) + " more: type more of the name";
      list.appendChild(more);
    }
  }

  // The box exists only with the script, so pages carry no markup for it:
  // a search form in the top bar, before the tally.
  function makeForm(bar) {
    var form = document.createElement("form");
    form.className = "site-search";
    form.setAttribute("role", "search");
    var label = document.createElement("label");
    label.className = "visually-hidden";
    label.htmlFor = "site-search";
    label.textContent = "Search reactions, metabolites, loops";
    var input = document.createElement("input");
    input.id = "site-search";
    input.type = "search";
    input.placeholder = "Search id or name\u2026";
    input.autocomplete = "off";
    var list = document.createElement("ol");
    list.setAttribute("aria-label", "Search results");
    form.appendChild(label);
    form.appendChild(input);
    form.appendChild(list);
    bar.insertBefore(form, bar.querySelector(".tally"));
    return form;
  }

  document.addEventListener("DOMContentLoaded", function () {
    var bar = document.querySelector("header.topbar");
    if (!bar) return;
    var form = makeForm(bar);
    var root = document.body.getAttribute("data-root") || "";
    var input = form.querySelector("input");
    var list = form.querySelector("ol");
    function update() {
      load(root, function () { show(list, root, find(input.value)); });
    }
    input.addEventListener("focus", function () { load(root, function () {}); });
    input.addEventListener("input", update);
    input.addEventListener("keydown", function (event) {
      if (event.key === "Escape") { input.value = ""; show(list, root, []); }
    });
    form.addEventListener("submit", function (event) {
      event.preventDefault();
      var first = list.querySelector("a");
      if (first) window.location.href = first.href;
    });
  });
})();
