// Draws every chart on a page from the JSON block script#chart-data with Chart.js.
// Plain script, no framework; data come pre-computed and pre-rounded.
// The axis helpers (log ticks at 1, 2 and 5 per decade, padded ranges) are
// published as globalThis.waferbookAxes so the unit tests can check them.
(function () {
  "use strict";
  var SUP = { "-": "\u207b", 0: "\u2070", 1: "\u00b9", 2: "\u00b2", 3: "\u00b3", 4: "\u2074", 5: "\u2075", 6: "\u2076", 7: "\u2077", 8: "\u2078", 9: "\u2079" };
  /** A number as a short label: plain between 10⁻³ and 10⁴, else m×10ᵉ with superscript digits. */
  function sci(v) {
    if (v === 0) return "0";
    var a = Math.abs(v);
    if (a >= 1e-3 && a < 1e4) return String(Number(v.toPrecision(3)));
    var e = Math.floor(Math.log10(a) + 1e-9),
      m = v / Math.pow(10, e);
    var exp = String(e)
      .split("")
      .map(function (c) {
        return SUP[c] || c;
      })
      .join("");
    return (Math.abs(Math.abs(m) - 1) < 1e-9 ? (m < 0 ? "\u2212" : "") : Number(m.toPrecision(3)) + "\u00d7") + "10" + exp;
  }
  /** Round off floating-point noise of m × 10^k (so 2e11 prints as 2×10¹¹, not 1.9999…). */
  function clean(v) {
    return Number(v.toPrecision(12));
  }
  /** Values m × 10^k (m from `mantissas`) inside [min, max], ascending. */
  function decadeTicks(min, max, mantissas) {
    var out = [];
    if (!(min > 0) || !(max >= min)) return out;
    for (var k = Math.floor(Math.log10(min)) - 1; k <= Math.ceil(Math.log10(max)); k++) {
      for (var i = 0; i < mantissas.length; i++) {
        var v = clean(mantissas[i] * Math.pow(10, k));
        if (v >= min * (1 - 1e-9) && v <= max * (1 + 1e-9)) out.push(v);
      }
    }
    return out;
  }
  /** Ticks at 1, 2 and 5 per decade inside [min, max]. */
  function logTicks(min, max) {
    return decadeTicks(min, max, [1, 2, 5]);
  }
  /** Mantissa sets from coarse to fine: 1-2-5 first, finer only for ranges too narrow for it. */
  var LEVELS = [
    [1, 2, 5],
    [1, 2, 3, 4, 5, 6, 7, 8, 9],
    [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 7, 8, 9],
  ];
  /** Largest gap between neighbouring ticks (and the axis ends) as a fraction of the axis, in decades. */
  function widestGap(min, max, ticks) {
    var edges = [min].concat(ticks, [max]).map(function (v) {
      return Math.log10(v);
    });
    var g = 0;
    for (var i = 1; i < edges.length; i++) g = Math.max(g, edges[i] - edges[i - 1]);
    return g / (edges[edges.length - 1] - edges[0]);
  }
  /** Largest m × 10^k ≤ v (or smallest ≥ v when `up`), m from `mantissas`. */
  function snap(v, mantissas, up) {
    var k = Math.floor(Math.log10(v) + 1e-9),
      best = up ? Infinity : 0;
    [k - 1, k, k + 1].forEach(function (e) {
      mantissas.forEach(function (m) {
        var c = clean(m * Math.pow(10, e));
        if (up ? c >= v * (1 - 1e-9) && c < best : c <= v * (1 + 1e-9) && c > best) best = c;
      });
    });
    return best;
  }
  /**
   * A log axis for data between lo and hi (both > 0): the range widened on each side by
   * `pad` of its span in decades (at least 0.04 decade), so no point touches the frame.
   * Ticks at 1, 2 and 5 per decade when that gives at least three ticks with no gap wider
   * than 45 % of the axis; otherwise every mantissa 1…9, then 1, 1.2, 1.5, 2, 2.5, 3…9 by the
   * same test; when even the finest leaves fewer than three, the range is widened to the
   * neighbouring ticks of the finest set.
   */
  function logAxis(lo, hi, pad) {
    var a = Math.log10(lo),
      b = Math.log10(hi);
    var p = Math.max((b - a) * (pad == null ? 0.06 : pad), 0.04);
    var min = Math.pow(10, a - p),
      max = Math.pow(10, b + p);
    for (var i = 0; i < LEVELS.length; i++) {
      var ticks = decadeTicks(min, max, LEVELS[i]);
      if (ticks.length >= 3 && widestGap(min, max, ticks) <= 0.45) return { min: min, max: max, ticks: ticks };
    }
    var fine = LEVELS[LEVELS.length - 1];
    min = snap(min, fine, false);
    max = snap(max, fine, true);
    return { min: min, max: max, ticks: decadeTicks(min, max, fine) };
  }
  // Packed series (src/publish/charts.ts chartDataJson): each coordinate is [step, first, deltas(, 1 for log10)],
  // the deltas zigzag base-32 varints in the URL-safe base64 alphabet; turned back into [x, y] points once on load.
  var DIGITS = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";
  function unpackAxis(a) {
    var step = a[0],
      k = a[1],
      text = a[2],
      log = a[3] === 1,
      inv = step < 1 ? Math.round(1 / step) : 0;
    var ks = [k],
      z = 0,
      mul = 1;
    for (var i = 0; i < text.length; i++) {
      var c = DIGITS.indexOf(text.charAt(i));
      z += (c % 32) * mul;
      if (c >= 32) {
        mul *= 32;
        continue;
      }
      k += z % 2 ? -(z + 1) / 2 : z / 2;
      ks.push(k);
      z = 0;
      mul = 1;
    }
    return ks.map(function (q) {
      var v = inv ? q / inv : q * step;
      return log ? Math.pow(10, v) : v;
    });
  }
  function unpackSeries(s) {
    if (s.points || !s.x) return s;
    var x = unpackAxis(s.x),
      y = unpackAxis(s.y);
    s.points = x.map(function (v, i) {
      return [v, y[i]];
    });
    return s;
  }
  function unpackSpecs(specs) {
    specs.forEach(function (spec) {
      (spec.series || []).forEach(unpackSeries);
      (spec.views || []).forEach(function (v) {
        v.series.forEach(unpackSeries);
      });
    });
    return specs;
  }
  var api = { sci: sci, logTicks: logTicks, logAxis: logAxis, unpackSpecs: unpackSpecs };
  if (typeof globalThis !== "undefined") globalThis.waferbookAxes = api;
  if (typeof document === "undefined") return;

  // Found as a script element, not by id alone, so an element of the notes or figures given the same id cannot stand in for it.
  var el = document.querySelector('script[type="application/json"]#chart-data');
  if (!el || typeof Chart === "undefined") return;
  var specs = unpackSpecs(JSON.parse(el.textContent || "[]"));
  // Series of equal rank (data, second … fifth) differ in colour and in marker shape or dash, never colour alone.
  var palette = {
    data: "#2c5f66",
    second: "#b5632d",
    third: "#6a3c98",
    fourth: "#1f5a8a",
    fifth: "#8a5d00",
    fit: "#1d262b",
    reference: "#5d6368",
    muted: "#5d6368",
    flag: "#a4262c",
  };
  var dashes = { data: [], second: [6, 3], third: [2, 2], fourth: [10, 3, 2, 3], fifth: [1, 3], fit: [8, 4], reference: [3, 3], muted: [2, 4], flag: [] };
  var shapes = {
    data: "circle",
    second: "rect",
    third: "triangle",
    fourth: "rectRot",
    fifth: "star",
    fit: "crossRot",
    reference: "rectRot",
    muted: "circle",
    flag: "circle",
  };
  var HOLLOW = { muted: true, flag: true, fifth: true };
  var TARGET = { line: "#2d7047", fill: "rgba(45,112,71,0.12)", dash: [5, 4] };
  function unitOf(label) {
    var m = /\(([^)]*)\)\s*$/.exec(label);
    return m ? " " + m[1] : "";
  }
  function day(v) {
    return new Date(Math.round(v) * 86400000).toISOString().slice(0, 10);
  }

  function dataset(s) {
    var role = s.role || "data";
    var ds = {
      label: s.label,
      yAxisID: s.axis === "y2" ? "y2" : "y",
      data: s.points.map(function (p) {
        return { x: p[0], y: p[1] };
      }),
      showLine: s.line,
      borderColor: palette[role],
      backgroundColor: palette[role],
      borderDash: s.line ? dashes[role] : [],
      pointStyle: shapes[role],
      // Markers at least 4.5 px in radius; open shapes (cross, star, rings) drawn with a 2 px stroke.
      pointRadius: s.line ? 0 : role === "flag" ? 7.5 : role === "fifth" || role === "fit" ? 5.5 : 4.5,
      pointHoverRadius: s.line ? 3 : 7,
      borderWidth: s.line ? 1.8 : HOLLOW[role] || role === "fit" ? 2 : 1,
      parsing: false,
      links: s.links,
      tips: s.tips,
    };
    if (!s.line && HOLLOW[role]) ds.backgroundColor = "rgba(0,0,0,0)";
    if (role === "flag") ds.order = -1;
    return ds;
  }

  // Legend swatches drawn like the series: a line sample in its dash pattern, a marker in its shape and size.
  var SW = 36,
    SH = 16;
  function swatch(draw) {
    var c = document.createElement("canvas");
    c.width = SW;
    c.height = SH;
    draw(c.getContext("2d"));
    return c;
  }
  function seriesSwatch(ds) {
    return swatch(function (ctx) {
      ctx.strokeStyle = ds.borderColor;
      ctx.fillStyle = ds.backgroundColor;
      if (ds.showLine) {
        ctx.lineWidth = 2.2;
        ctx.setLineDash(ds.borderDash || []);
        ctx.beginPath();
        ctx.moveTo(1, SH / 2);
        ctx.lineTo(SW - 1, SH / 2);
        ctx.stroke();
      } else {
        ctx.lineWidth = ds.borderWidth;
        Chart.helpers.drawPoint(
          ctx,
          { pointStyle: ds.pointStyle, radius: Math.max(4.5, Math.min(ds.pointRadius, 6.5)), rotation: 0, borderWidth: ds.borderWidth },
          SW / 2,
          SH / 2,
        );
      }
    });
  }
  var targetSwatch = function () {
    return swatch(function (ctx) {
      ctx.fillStyle = TARGET.fill;
      ctx.fillRect(1, 2, SW - 2, SH - 4);
      ctx.strokeStyle = TARGET.line;
      ctx.lineWidth = 1.6;
      ctx.setLineDash(TARGET.dash);
      ctx.beginPath();
      ctx.moveTo(1, 2.5);
      ctx.lineTo(SW - 1, 2.5);
      ctx.moveTo(1, SH - 2.5);
      ctx.lineTo(SW - 1, SH - 2.5);
      ctx.stroke();
    });
  };
  function legendLabels(spec) {
    return function (chart) {
      var items = chart.data.datasets.map(function (ds, i) {
        return {
          text: ds.label,
          pointStyle: seriesSwatch(ds),
          hidden: !chart.isDatasetVisible(i),
          datasetIndex: i,
          lineWidth: 0,
          strokeStyle: "rgba(0,0,0,0)",
          fillStyle: "rgba(0,0,0,0)",
        };
      });
      (spec.limits || []).forEach(function (l) {
        items.push({
          text: l.label + " (shaded: within the target)",
          pointStyle: targetSwatch(),
          hidden: false,
          lineWidth: 0,
          strokeStyle: "rgba(0,0,0,0)",
          fillStyle: "rgba(0,0,0,0)",
        });
      });
      return items;
    };
  }

  /** Positive values of one axis over every series (and view) of a spec. */
  function extent(spec, axis) {
    var lo = Infinity,
      hi = -Infinity;
    var sets = spec.views
      ? spec.views.reduce(function (a, v) {
          return a.concat(v.series);
        }, [])
      : spec.series;
    sets.forEach(function (s) {
      var mine = axis === "x" || (axis === "y2") === (s.axis === "y2");
      if (!mine) return;
      s.points.forEach(function (p) {
        var v = axis === "x" ? p[0] : p[1];
        if (v > 0 && v < lo) lo = v;
        if (v > 0 && v > hi) hi = v;
      });
    });
    return lo <= hi ? [lo, hi] : null;
  }
  function scale(spec, axis, opt) {
    var markersOnly = !(spec.views ? spec.views[0].series : spec.series).some(function (s) {
      return s.line;
    });
    var out = {
      type: opt.log ? "logarithmic" : "linear",
      title: { display: true, text: opt.label },
      ticks: {
        callback: opt.dates
          ? function (v) {
              return day(v);
            }
          : sci,
      },
    };
    if (axis === "y2") {
      out.position = "right";
      out.grid = { drawOnChartArea: false };
    }
    if (opt.log) {
      var e = extent(spec, axis);
      if (e) {
        var a = logAxis(e[0], e[1]);
        out.min = a.min;
        out.max = a.max;
        out.ticks = { autoSkip: false, maxRotation: 0, callback: sci };
        out.afterBuildTicks = function (s) {
          s.ticks = a.ticks.map(function (v) {
            return { value: v };
          });
        };
      }
    } else if (markersOnly && !opt.dates) {
      out.grace = "4%";
    }
    return out;
  }

  function limitPlugin(limitSets) {
    return {
      id: "targetLimits",
      beforeDatasetsDraw: function (chart) {
        var ctx = chart.ctx,
          area = chart.chartArea;
        limitSets.forEach(function (l) {
          var s = chart.scales[l.axis];
          var lo = l.min != null ? s.getPixelForValue(l.min) : null;
          var hi = l.max != null ? s.getPixelForValue(l.max) : null;
          ctx.save();
          ctx.fillStyle = TARGET.fill;
          ctx.strokeStyle = TARGET.line;
          ctx.lineWidth = 1.6;
          ctx.setLineDash(TARGET.dash);
          if (l.axis === "y") {
            var top = hi != null ? hi : area.top,
              bottom = lo != null ? lo : area.bottom;
            ctx.fillRect(area.left, Math.max(area.top, top), area.right - area.left, Math.min(area.bottom, bottom) - Math.max(area.top, top));
            [lo, hi].forEach(function (p) {
              if (p != null && p >= area.top && p <= area.bottom) {
                ctx.beginPath();
                ctx.moveTo(area.left, p);
                ctx.lineTo(area.right, p);
                ctx.stroke();
              }
            });
          } else {
            var left = lo != null ? lo : area.left,
              right = hi != null ? hi : area.right;
            ctx.fillRect(Math.max(area.left, left), area.top, Math.min(area.right, right) - Math.max(area.left, left), area.bottom - area.top);
            [lo, hi].forEach(function (p) {
              if (p != null && p >= area.left && p <= area.right) {
                ctx.beginPath();
                ctx.moveTo(p, area.top);
                ctx.lineTo(p, area.bottom);
                ctx.stroke();
              }
            });
          }
          ctx.restore();
        });
      },
    };
  }

  function draw(spec, canvas) {
    var first = spec.views ? spec.views[spec.view || 0].series : spec.series;
    var scales = { x: scale(spec, "x", spec.x), y: scale(spec, "y", spec.y) };
    if (spec.y2) scales.y2 = scale(spec, "y2", spec.y2);
    var chart = new Chart(canvas, {
      type: "scatter",
      data: { datasets: first.map(dataset) },
      options: {
        animation: false,
        maintainAspectRatio: false,
        responsive: true,
        scales: scales,
        plugins: {
          legend: {
            labels: { usePointStyle: true, pointStyleWidth: SW, generateLabels: legendLabels(spec) },
            // The target band's entry names what is drawn but has no series to hide.
            onClick: function (e, item, legend) {
              if (item.datasetIndex != null) Chart.defaults.plugins.legend.onClick.call(this, e, item, legend);
            },
          },
          tooltip: {
            callbacks: {
              label: function (c) {
                var tip = c.dataset.tips?.[c.dataIndex];
                var y = c.dataset.yAxisID === "y2" ? spec.y2 : spec.y;
                var x = spec.x.dates ? day(c.parsed.x) : sci(c.parsed.x) + unitOf(spec.x.label);
                return (tip || c.dataset.label) + ": " + x + ", " + sci(c.parsed.y) + unitOf(y.label);
              },
            },
          },
        },
        onClick: function (_e, items, ch) {
          for (var i = 0; i < items.length; i++) {
            var ds = ch.data.datasets[items[i].datasetIndex];
            if (ds.links?.[items[i].index]) {
              window.location.href = ds.links[items[i].index];
              return;
            }
          }
        },
        onHover: function (_e, items, ch) {
          var linked = items.some(function (it) {
            var ds = ch.data.datasets[it.datasetIndex];
            return ds.links?.[it.index];
          });
          ch.canvas.style.cursor = linked ? "pointer" : "";
        },
      },
      plugins: [limitPlugin(spec.limits || [])],
    });
    // A chart with views (e.g. one per gate voltage) is switched by its <select>, written by the page template.
    var select = document.querySelector('select[data-chart-view="' + spec.id + '"]');
    if (select && spec.views) {
      select.addEventListener("change", function () {
        var v = spec.views[Number(select.value)];
        if (!v) return;
        chart.data.datasets = v.series.map(dataset);
        chart.update();
        var cap = document.querySelector('[data-chart-view-caption="' + spec.id + '"]');
        if (cap && v.caption) cap.textContent = v.caption;
      });
    }
    return chart;
  }

  specs.forEach(function (spec) {
    var canvas = document.querySelector('canvas[data-chart="' + spec.id + '"]');
    if (canvas) draw(spec, canvas);
  });
  // Printing: each chart is redrawn at the size of half an A4 text width (print CSS sets two to a row), then for the screen again.
  var PRINT_SIZE = [340, 230];
  // Legends and ticks a little smaller on paper, so the plot keeps its room in half a text width.
  function fonts(c, size) {
    c.options.plugins.legend.labels.font = { size: size };
    c.options.plugins.legend.labels.padding = size === 12 ? 10 : 4;
    Object.values(c.options.scales).forEach(function (s) {
      s.ticks.font = { size: size - 1 };
      s.title.font = { size: size };
    });
  }
  window.addEventListener("beforeprint", function () {
    Object.values(Chart.instances).forEach(function (c) {
      fonts(c, 10);
      c.update("none");
      c.resize(PRINT_SIZE[0], PRINT_SIZE[1]);
    });
  });
  window.addEventListener("afterprint", function () {
    Object.values(Chart.instances).forEach(function (c) {
      fonts(c, 12);
      c.update("none");
      c.resize();
    });
  });
})();
