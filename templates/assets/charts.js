// Draws every chart on a page from the JSON block #chart-data with Chart.js.
// Plain script, no framework; data come pre-computed and pre-rounded.
(function () {
  "use strict";
  var el = document.getElementById("chart-data");
  if (!el || typeof Chart === "undefined") return;
  var specs = JSON.parse(el.textContent || "[]");
  var palette = { data: "#2c5f66", second: "#b5632d", third: "#6a3c98", fit: "#1d262b", reference: "#7b8085", flag: "#a4262c" };
  var dashes = { data: [], second: [6, 3], third: [2, 2], fit: [8, 4], reference: [3, 3], flag: [] };
  var shapes = { data: "circle", second: "rect", third: "triangle", fit: "crossRot", reference: "line", flag: "circle" };
  var SUP = { "-": "\u207b", "0": "\u2070", "1": "\u00b9", "2": "\u00b2", "3": "\u00b3", "4": "\u2074", "5": "\u2075", "6": "\u2076", "7": "\u2077", "8": "\u2078", "9": "\u2079" };
  function sci(v) {
    if (v === 0) return "0";
    var a = Math.abs(v);
    if (a >= 1e-3 && a < 1e4) return String(Number(v.toPrecision(3)));
    var e = Math.floor(Math.log10(a)), m = v / Math.pow(10, e);
    var exp = String(e).split("").map(function (c) { return SUP[c] || c; }).join("");
    return (Math.abs(m - 1) < 1e-9 ? "" : Number(m.toPrecision(3)) + "\u00d7") + "10" + exp;
  }
  // Log axes: label only 1, 2 and 5 × 10^k so ticks stay readable.
  function logTick(v) {
    var m = v / Math.pow(10, Math.floor(Math.log10(v)));
    return [1, 2, 5].some(function (k) { return Math.abs(m - k) < 1e-6; }) ? sci(v) : "";
  }
  function unitOf(label) { var m = /\(([^)]*)\)\s*$/.exec(label); return m ? " " + m[1] : ""; }
  function day(v) { return new Date(Math.round(v) * 86400000).toISOString().slice(0, 10); }
  specs.forEach(function (spec) {
    var canvas = document.querySelector('canvas[data-chart="' + spec.id + '"]');
    if (!canvas) return;
    var datasets = spec.series.map(function (s) {
      var role = s.role || "data";
      var ds = {
        label: s.label,
        data: s.points.map(function (p) { return { x: p[0], y: p[1] }; }),
        showLine: s.line,
        borderColor: palette[role], backgroundColor: palette[role],
        borderDash: dashes[role], pointStyle: shapes[role],
        pointRadius: s.line ? 0 : role === "flag" ? 7 : 3.5, borderWidth: s.line ? 1.6 : role === "flag" ? 2 : 1, parsing: false,
        links: s.links, tips: s.tips
      };
      if (role === "flag") { ds.backgroundColor = "rgba(0,0,0,0)"; ds.order = -1; }
      return ds;
    });
    var limitSets = (spec.limits || []).map(function (l) { return l; });
    new Chart(canvas, {
      type: "scatter",
      data: { datasets: datasets },
      options: {
        animation: false, maintainAspectRatio: false, responsive: true,
        scales: {
          x: { type: spec.x.log ? "logarithmic" : "linear", title: { display: true, text: spec.x.label },
            ticks: { callback: spec.x.dates ? function (v) { return day(v); } : spec.x.log ? logTick : sci } },
          y: { type: spec.y.log ? "logarithmic" : "linear", title: { display: true, text: spec.y.label }, ticks: { callback: spec.y.log ? logTick : sci } }
        },
        plugins: {
          legend: { labels: { usePointStyle: true } },
          tooltip: { callbacks: { label: function (c) {
            var tip = c.dataset.tips && c.dataset.tips[c.dataIndex];
            var x = spec.x.dates ? day(c.parsed.x) : sci(c.parsed.x) + unitOf(spec.x.label);
            return (tip || c.dataset.label) + ": " + x + ", " + sci(c.parsed.y) + unitOf(spec.y.label);
          } } }
        },
        onClick: function (e, items, chart) {
          for (var i = 0; i < items.length; i++) {
            var ds = chart.data.datasets[items[i].datasetIndex];
            if (ds.links && ds.links[items[i].index]) { window.location.href = ds.links[items[i].index]; return; }
          }
        },
        onHover: function (e, items, chart) {
          var linked = items.some(function (it) { var ds = chart.data.datasets[it.datasetIndex]; return ds.links && ds.links[it.index]; });
          chart.canvas.style.cursor = linked ? "pointer" : "";
        }
      },
      plugins: [{
        id: "targetLimits",
        beforeDatasetsDraw: function (chart) {
          var ctx = chart.ctx, area = chart.chartArea;
          limitSets.forEach(function (l) {
            var scale = chart.scales[l.axis];
            var lo = l.min != null ? scale.getPixelForValue(l.min) : null;
            var hi = l.max != null ? scale.getPixelForValue(l.max) : null;
            ctx.save();
            ctx.fillStyle = "rgba(45,112,71,0.08)";
            ctx.strokeStyle = "#2d7047"; ctx.setLineDash([5, 4]);
            if (l.axis === "y") {
              var top = hi != null ? hi : area.top, bottom = lo != null ? lo : area.bottom;
              ctx.fillRect(area.left, Math.max(area.top, top), area.right - area.left, Math.min(area.bottom, bottom) - Math.max(area.top, top));
              [lo, hi].forEach(function (p) { if (p != null && p >= area.top && p <= area.bottom) { ctx.beginPath(); ctx.moveTo(area.left, p); ctx.lineTo(area.right, p); ctx.stroke(); } });
            } else {
              var left = lo != null ? lo : area.left, right = hi != null ? hi : area.right;
              ctx.fillRect(Math.max(area.left, left), area.top, Math.min(area.right, right) - Math.max(area.left, left), area.bottom - area.top);
              [lo, hi].forEach(function (p) { if (p != null && p >= area.left && p <= area.right) { ctx.beginPath(); ctx.moveTo(p, area.top); ctx.lineTo(p, area.bottom); ctx.stroke(); } });
            }
            ctx.restore();
          });
        }
      }]
    });
  });
})();
