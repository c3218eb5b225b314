// Zoom and pan for the network maps: wheel zooms about the pointer, drag
// pans, double-click restores the whole map. Without JavaScript the maps
// are plain scalable drawings.
(function () {
  "use strict";
  function setup(svg) {
    var base = svg.viewBox.baseVal;
    var home = [base.x, base.y, base.width, base.height];
    var box = home.slice();
    var drag = null;
    function apply() { svg.setAttribute("viewBox", box.join(" ")); }
    function point(e) {
      var r = svg.getBoundingClientRect();
      return [box[0] + (e.clientX - r.left) / r.width * box[2],
              box[1] + (e.clientY - r.top) / r.height * box[3]];
    }
    svg.addEventListener("wheel", function (e) {
      e.preventDefault();
      var p = point(e);
      var f = e.deltaY < 0 ? 0.8 : 1.25;
      var w = Math.min(Math.max(box[2] * f, home[2] / 20), home[2] * 4);
      var k = w / box[2];
      box = [p[0] - (p[0] - box[0]) * k, p[1] - (p[1] - box[1]) * k, w, box[3] * k];
      apply();
    }, { passive: false });
    svg.addEventListener("pointerdown", function (e) {
      if (e.button !== 0) { return; }
      drag = { x: e.clientX, y: e.clientY, box: box.slice(), moved: false };
    });
    window.addEventListener("pointermove", function (e) {
      if (!drag) { return; }
      var r = svg.getBoundingClientRect();
      var dx = (e.clientX - drag.x) / r.width * box[2];
      var dy = (e.clientY - drag.y) / r.height * box[3];
      if (Math.abs(e.clientX - drag.x) + Math.abs(e.clientY - drag.y) > 3) { drag.moved = true; }
      box = [drag.box[0] - dx, drag.box[1] - dy, box[2], box[3]];
      apply();
    });
    window.addEventListener("pointerup", function () { setTimeout(function () { drag = null; }, 0); });
    // A drag must not follow the link under the pointer.
    svg.addEventListener("click", function (e) {
      if (drag && drag.moved) { e.preventDefault(); }
    }, true);
    svg.addEventListener("dblclick", function (e) {
      e.preventDefault();
      box = home.slice();
      apply();
    });
    // Says the map is interactive (the browser test looks for it).
    svg.setAttribute("data-zoom", "ready");
  }
  document.addEventListener("DOMContentLoaded", function () {
    var maps = document.querySelectorAll("figure.net-map-figure svg.net-map");
    for (var i = 0; i < maps.length; i++) { setup(maps[i]); }
  });
})();
