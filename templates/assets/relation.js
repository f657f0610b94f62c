// The relation page: one metric or growth condition against another across
// the wafers that pass the filters (run, reactor, grade, growth dates), a
// series per run or reactor (shape, dash and name, never colour alone), each
// point labelled with its wafer, and the least-squares line with r and n
// (assets/leastSquares.js). A quantity the metric registry marks log-like
// (mobility, densities, τ_q, contaminant peaks: src/model/metricScale.ts) is
// drawn on a log axis unless the reader asks for linear axes, and the line is
// fitted in the space drawn (a power law on log–log axes), so r and its
// interval are of the values as plotted; the caption says which. The state
// lives in the address (?x=&y=&by=&scale=&run=&reactor=&grade=&from=&to=),
// so a view can be linked.
(function () {
  "use strict";
  var form = document.getElementById("relation-form");
  var dataEl = document.getElementById("relation-data");
  var status = document.getElementById("relation-status");
  if (!form || !dataEl || !status || typeof Chart === "undefined" || !window.waferbookPlot) return;
  var data = JSON.parse(dataEl.textContent || "{}");
  var root = form.getAttribute("data-root") || "";
  var relative = root.charAt(0) !== "/";
  function link(href) {
    return root + href + (relative && (href === "" || href.slice(-1) === "/") ? "index.html" : "");
  }
  var sci = window.waferbookPlot.sci;
  var vars = {};
  data.variables.forEach(function (v) {
    vars[v.key] = v;
  });
  var fields = ["x", "y", "by", "scale", "run", "reactor", "grade", "from", "to"];
  var canvas = document.getElementById("relation-canvas");
  var chart = null;

  function control(name) {
    return form.elements.namedItem(name);
  }
  function axisLabel(v) {
    return v.label + (v.unit ? " (" + v.unit + ")" : "");
  }
  function readUrl() {
    var p = new URLSearchParams(location.search);
    fields.forEach(function (f) {
      var c = control(f),
        v = p.get(f);
      if (v == null) return;
      if (
        c.tagName === "SELECT" &&
        !Array.prototype.some.call(c.options, function (o) {
          return o.value === v;
        })
      )
        return;
      c.value = v;
    });
    // Defaults: the well's growth temperature against peak mobility when both exist.
    if (!p.get("x")) {
      var gx =
        data.variables.filter(function (v) {
          return /well_temperature$/.test(v.key);
        })[0] ||
        data.variables.filter(function (v) {
          return v.group === "growth";
        })[0];
      if (gx) control("x").value = gx.key;
    }
    if (!p.get("y") && vars.peak_mobility) control("y").value = "peak_mobility";
  }
  function writeUrl() {
    var p = new URLSearchParams();
    fields.forEach(function (f) {
      var v = control(f).value;
      if (v) p.set(f, v);
    });
    try {
      history.replaceState(null, "", location.pathname + "?" + p.toString() + location.hash);
    } catch (_err) {
      /* some browsers refuse from disk */
    }
  }
  function draw() {
    var xv = vars[control("x").value],
      yv = vars[control("y").value],
      by = control("by").value === "reactor" ? "reactor" : "run";
    if (!xv || !yv) {
      status.textContent = "Nothing to plot: the site has no metric values or growth conditions.";
      return;
    }
    var f = {
      run: control("run").value,
      reactor: control("reactor").value,
      grade: control("grade").value,
      from: control("from").value,
      to: control("to").value,
    };
    var shown = data.wafers.filter(function (w) {
      if (f.run && w.run !== f.run) return false;
      if (f.reactor && w.reactor !== f.reactor) return false;
      if (f.grade && w.grade !== f.grade) return false;
      if (f.from && (!w.grown || w.grown < f.from)) return false;
      if (f.to && (!w.grown || w.grown > f.to)) return false;
      return true;
    });
    var pts = shown.filter(function (w) {
      return w.values[xv.key] != null && w.values[yv.key] != null;
    });
    var groups = [];
    pts.forEach(function (w) {
      var g = w[by] || "(none)";
      if (groups.indexOf(g) < 0) groups.push(g);
    });
    groups.sort();
    var series = groups.map(function (g, i) {
      var ws = pts.filter(function (w) {
        return (w[by] || "(none)") === g;
      });
      return {
        label: by + " " + g + " (" + ws.length + ")",
        style: i,
        points: ws.map(function (w) {
          return [w.values[xv.key], w.values[yv.key]];
        }),
        labels: ws.map(function (w) {
          return w.id;
        }),
        links: ws.map(function (w) {
          return link("wafers/" + w.id + "/");
        }),
      };
    });
    // Log axes where the quantity is log-like, unless linear axes are asked for or a plotted value is not > 0.
    var linear = control("scale").value === "linear";
    function positive(v) {
      return pts.every(function (w) {
        return w.values[v.key] > 0;
      });
    }
    var logX = !linear && xv.log && positive(xv),
      logY = !linear && yv.log && positive(yv);
    var notLog = !linear && ((xv.log && !logX) || (yv.log && !logY));
    var ls = window.waferbookLeastSquares;
    var fit = ls(
      pts.map(function (w) {
        return [w.values[xv.key], w.values[yv.key]];
      }),
      { logX: logX, logY: logY },
    );
    var fitText;
    if (fit) {
      var xs = pts.map(function (w) {
        return w.values[xv.key];
      });
      var x0 = Math.min.apply(null, xs),
        x1 = Math.max.apply(null, xs);
      fitText =
        fitEquation(fit) +
        ", r = " +
        fit.r.toFixed(3) +
        ", n = " +
        fit.n +
        (fit.rLow !== null ? " (95 % interval of r: " + fit.rLow.toFixed(2) + " to " + fit.rHigh.toFixed(2) + ")" : "") +
        (logX || logY
          ? "; r and its interval are of " +
            (logX && logY ? "log\u2081\u2080 x and log\u2081\u2080 y" : logY ? "x and log\u2081\u2080 y" : "log\u2081\u2080 x and y")
          : "") +
        (fit.n < 8 ? ". Few wafers: read this as a hint, not a finding." : ".");
      series.push({
        label: "least squares (r = " + fit.r.toFixed(2) + ", n = " + fit.n + ")",
        style: 7,
        line: true,
        dash: [8, 4],
        points: [
          [x0, ls.predict(fit, x0)],
          [x1, ls.predict(fit, x1)],
        ],
      });
    } else fitText = "No least-squares line: it needs at least 3 wafers whose values vary (" + pts.length + " plotted).";
    if (notLog) fitText += " Linear axes: a plotted value is zero or negative, so no log axis.";
    var scaleText = logX && logY ? "both axes logarithmic" : logX ? "x axis logarithmic" : logY ? "y axis logarithmic" : "";
    var title = axisLabel(yv) + " against " + axisLabel(xv) + (scaleText ? " (" + scaleText + ")" : "");
    document.getElementById("relation-title").textContent = title;
    canvas.setAttribute("aria-label", title + ", " + pts.length + " wafers in " + groups.length + " series by " + by + ". " + fitText);
    document.getElementById("relation-fit").textContent = fitText;
    document.getElementById("relation-xh").textContent = axisLabel(xv);
    document.getElementById("relation-yh").textContent = axisLabel(yv);
    var tb = document.querySelector("#relation-table tbody");
    tb.textContent = "";
    pts.forEach(function (w) {
      var tr = document.createElement("tr"),
        th = document.createElement("th"),
        a = document.createElement("a");
      th.scope = "row";
      a.href = link("wafers/" + w.id + "/");
      a.textContent = w.id;
      th.appendChild(a);
      tr.appendChild(th);
      [by + " " + (w[by] || "(none)"), sci(w.values[xv.key]), sci(w.values[yv.key])].forEach(function (t, i) {
        var td = document.createElement("td");
        td.textContent = t;
        if (i) td.className = "num";
        tr.appendChild(td);
      });
      tb.appendChild(tr);
    });
    var missing = shown.length - pts.length;
    status.textContent =
      pts.length +
      " of " +
      data.wafers.length +
      (data.wafers.length === 1 ? " wafer" : " wafers") +
      " plotted" +
      (missing ? "; " + missing + " pass the filters but lack one of the two values" : "") +
      ".";
    if (chart) chart.destroy();
    chart = pts.length
      ? window.waferbookPlot(canvas, { x: { label: axisLabel(xv), log: logX }, y: { label: axisLabel(yv), log: logY }, series: series })
      : null;
  }
  // The fitted line as an equation in the units plotted: straight on the axes drawn.
  function fitEquation(f) {
    var sign = f.slope < 0 ? " \u2212 " : " + ",
      b = sci(Math.abs(f.slope));
    if (f.logX && f.logY)
      return (
        "Least squares on log\u2013log axes, log\u2081\u2080 y on log\u2081\u2080 x: the power law y = " +
        sci(Math.pow(10, f.intercept)) +
        "\u00b7x^" +
        f.slope.toPrecision(3).replace("-", "\u2212")
      );
    if (f.logY) return "Least squares of log\u2081\u2080 y on x: y = " + sci(Math.pow(10, f.intercept)) + "\u00b710^(" + sci(f.slope) + "\u00b7x)";
    if (f.logX) return "Least squares of y on log\u2081\u2080 x: y = " + sci(f.intercept) + sign + b + "\u00b7log\u2081\u2080 x";
    return "Least squares: y = " + sci(f.intercept) + sign + b + "\u00b7x";
  }
  readUrl();
  form.addEventListener("change", function () {
    writeUrl();
    draw();
  });
  form.addEventListener("submit", function (e) {
    e.preventDefault();
    writeUrl();
    draw();
  });
  draw();
})();
