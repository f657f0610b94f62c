// Scatter and line charts for the comparison and relation pages, drawn with
// Chart.js: one series per wafer, run or reactor, each told apart by a
// marker shape, a line dash and its name in the legend (never colour alone);
// optional text labels beside points; log axes labelled at 1, 2 and 5 per
// decade (finer over a narrow range: charts.js logAxis); every axis padded so
// no point sits on the frame.
// window.waferbookPlot(canvas, spec) → the Chart; spec: { x: {label, log}, y: {label, log},
//   series: [{ label, points: [[x, y]], line, style, labels, links, dash }] }.
(function () {
  "use strict";
  var COLOURS = ["#2c5f66", "#b5632d", "#6a3c98", "#1d6b3a", "#a4262c", "#5b6770", "#8a6d00", "#1f4e96"];
  var SHAPES = ["circle", "rect", "triangle", "rectRot", "crossRot", "star", "cross", "rectRounded"];
  var DASHES = [[], [6, 3], [2, 2], [8, 3, 2, 3], [4, 4], [10, 2], [1, 3], [12, 4]];
  // Number labels and log axes (padded range, ticks at 1, 2 and 5 per decade, finer when the
  // range is narrower than that allows) are charts.js's, loaded first on these pages: one set for the site.
  var sci = globalThis.waferbookAxes.sci,
    logAxis = globalThis.waferbookAxes.logAxis;
  // A log axis over the positive values, or null when there are none.
  function logBounds(values) {
    var vs = values.filter(function (v) {
      return Number.isFinite(v) && v > 0;
    });
    return vs.length ? logAxis(Math.min.apply(null, vs), Math.max.apply(null, vs)) : null;
  }
  function axis(opt, values) {
    var out = { type: opt.log ? "logarithmic" : "linear", title: { display: true, text: opt.label }, ticks: { callback: sci } };
    var a = opt.log ? logBounds(values) : null;
    if (a) {
      out.min = a.min;
      out.max = a.max;
      out.ticks = { autoSkip: false, maxRotation: 0, callback: sci };
      out.afterBuildTicks = function (s) {
        s.ticks = a.ticks.map(function (v) {
          return { value: v };
        });
      };
    } else if (!opt.log) out.grace = "6%";
    return out;
  }
  var pointText = {
    id: "pointText",
    afterDatasetsDraw: function (chart) {
      var ctx = chart.ctx;
      ctx.save();
      ctx.font = "11px system-ui, sans-serif";
      ctx.fillStyle = "#1d262b";
      ctx.textBaseline = "middle";
      // Each label goes to the first of a few places beside its point that no earlier label covers.
      var placed = [],
        OFFSETS = [
          [6, -7],
          [6, 8],
          [-6, -7],
          [-6, 8],
          [6, -19],
          [-6, 19],
        ];
      function free(r) {
        return placed.every(function (q) {
          return r.x + r.w < q.x || q.x + q.w < r.x || r.y + r.h < q.y || q.y + q.h < r.y;
        });
      }
      chart.data.datasets.forEach(function (ds, i) {
        if (!ds.pointText || !chart.isDatasetVisible(i)) return;
        chart.getDatasetMeta(i).data.forEach(function (el, k) {
          var text = ds.pointText[k];
          if (!text) return;
          var w = ctx.measureText(text).width,
            box = null;
          for (var j = 0; j < OFFSETS.length && !box; j++) {
            var o = OFFSETS[j],
              r = { x: o[0] < 0 ? el.x + o[0] - w : el.x + o[0], y: el.y + o[1] - 6, w: w, h: 12 };
            if (free(r)) box = r;
          }
          box = box || { x: el.x + 6, y: el.y - 13, w: w, h: 12 };
          placed.push(box);
          ctx.fillText(text, box.x, box.y + 6);
        });
      });
      ctx.restore();
    },
  };
  window.waferbookPlot = function (canvas, spec) {
    var xs = [],
      ys = [];
    spec.series.forEach(function (s) {
      s.points.forEach(function (p) {
        xs.push(p[0]);
        ys.push(p[1]);
      });
    });
    var datasets = spec.series.map(function (s) {
      var k = (s.style || 0) % COLOURS.length;
      return {
        label: s.label,
        data: s.points.map(function (p) {
          return { x: p[0], y: p[1] };
        }),
        showLine: !!s.line,
        parsing: false,
        borderColor: COLOURS[k],
        backgroundColor: s.line ? COLOURS[k] : COLOURS[k] + "cc",
        borderDash: s.line ? s.dash || DASHES[k] : [],
        pointStyle: SHAPES[k],
        pointRadius: s.line ? 0 : 4.5,
        pointHoverRadius: s.line ? 0 : 6,
        borderWidth: s.line ? 1.8 : 1,
        pointText: s.labels,
        links: s.links,
      };
    });
    return new Chart(canvas, {
      type: "scatter",
      data: { datasets: datasets },
      options: {
        animation: false,
        maintainAspectRatio: false,
        responsive: true,
        layout: { padding: { right: 28, top: 6 } },
        scales: {
          x: axis(spec.x, xs),
          y: axis(spec.y, ys),
        },
        plugins: {
          legend: { labels: { usePointStyle: true, font: { size: 12 } } },
          tooltip: {
            callbacks: {
              label: function (c) {
                var name = c.dataset.pointText?.[c.dataIndex];
                return (name ? name + " (" + c.dataset.label + ")" : c.dataset.label) + ": " + sci(c.parsed.x) + ", " + sci(c.parsed.y);
              },
            },
          },
        },
        onClick: function (_e, items, chart) {
          for (var i = 0; i < items.length; i++) {
            var ds = chart.data.datasets[items[i].datasetIndex];
            if (ds.links?.[items[i].index]) {
              window.location.href = ds.links[items[i].index];
              return;
            }
          }
        },
      },
      plugins: [pointText],
    });
  };
  window.waferbookPlot.sci = sci;
})();
