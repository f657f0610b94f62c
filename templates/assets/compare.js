// The comparison page: reads the wafers named in the address (?w=A,B or
// ?run=R), loads each one's lean data (wafers/<id>/compare.js, a script so
// that the page also works opened from disk) and sets them side by side:
// overview, every metric with unit, verdict and difference from the first
// wafer, growth conditions, mobility against density, gate calibrations,
// depth profiles and layer stacks.
(function () {
  "use strict";
  var form = document.getElementById("compare-form");
  var out = document.getElementById("compare-out");
  var status = document.getElementById("compare-status");
  if (!form || !out || !status) return;
  var root = form.getAttribute("data-root") || "";
  var relative = root.charAt(0) !== "/";
  function link(href) {
    return root + href + (relative && (href === "" || href.slice(-1) === "/") ? "index.html" : "");
  }
  var MAX = 6;
  var boxes = Array.prototype.slice.call(form.querySelectorAll("input[name=w]"));
  var known = Object.create(null);
  boxes.forEach(function (b) {
    known[b.value] = b;
  });
  var sci = window.waferbookPlot ? window.waferbookPlot.sci : String;

  function el(tag, text, cls) {
    var e = document.createElement(tag);
    if (text != null) e.textContent = text;
    if (cls) e.className = cls;
    return e;
  }
  function mark(v) {
    var t = document.getElementById("verdict-marks");
    var found = t?.content.querySelector(".v-" + v);
    return found ? found.cloneNode(true) : el("span", v, "verdict");
  }

  // Which wafers: ?w=A,B (or repeated w=, as the form sends it), else ?run=R.
  var p = new URLSearchParams(location.search);
  var asked = [];
  p.getAll("w").forEach(function (v) {
    v.split(",").forEach(function (id) {
      id = id.trim();
      if (id && asked.indexOf(id) < 0) asked.push(id);
    });
  });
  var runAsked = p.get("run");
  if (!asked.length && runAsked)
    boxes.forEach(function (b) {
      if (b.getAttribute("data-run") === runAsked) asked.push(b.value);
    });
  var unknown = asked.filter(function (id) {
    return !known[id];
  });
  var ids = asked.filter(function (id) {
    return known[id];
  });
  var dropped = ids.length > MAX ? ids.slice(MAX) : [];
  ids = ids.slice(0, MAX);
  ids.forEach(function (id) {
    known[id].checked = true;
  });

  form.addEventListener("submit", function (e) {
    e.preventDefault();
    var chosen = ids.filter(function (id) {
      return known[id].checked;
    });
    boxes.forEach(function (b) {
      if (b.checked && chosen.indexOf(b.value) < 0) chosen.push(b.value);
    });
    if (chosen.length < 2 || chosen.length > MAX) {
      status.textContent = "Choose between 2 and " + MAX + " wafers (" + chosen.length + " chosen).";
      return;
    }
    location.href = form.getAttribute("action") + "?w=" + chosen.map(encodeURIComponent).join(",");
  });

  var notes = [];
  if (unknown.length) notes.push("Not in this site: " + unknown.join(", ") + ".");
  if (dropped.length) notes.push("At most " + MAX + " wafers are compared; left out: " + dropped.join(", ") + ".");
  if (ids.length < 2) {
    if (asked.length) status.textContent = notes.concat(["Choose at least 2 wafers (" + ids.length + " found in the address)."]).join(" ");
    return;
  }
  try {
    history.replaceState(null, "", location.pathname + "?w=" + ids.join(",") + location.hash);
  } catch (_err) {
    /* from disk some browsers refuse; the address still works */
  }
  status.textContent = "Loading " + ids.join(", ") + "\u2026";

  window.waferbookCompare = window.waferbookCompare || {};
  var pending = ids.length,
    failed = [];
  ids.forEach(function (id) {
    var s = document.createElement("script");
    s.src = link("wafers/" + id + "/compare.js");
    s.onload = s.onerror = function (e) {
      if (e.type === "error" || !window.waferbookCompare[id]) failed.push(id);
      if (--pending === 0) draw();
    };
    document.body.appendChild(s);
  });

  function section(id, title) {
    var s = el("section");
    s.id = id;
    s.setAttribute("aria-labelledby", id + "-h");
    var h = el("h2", title);
    h.id = id + "-h";
    s.appendChild(h);
    out.appendChild(s);
    return s;
  }
  function table(parent, caption, head) {
    var wrap = el("div", null, "table-wrap"),
      t = el("table", null, "compare"),
      tb = el("tbody");
    if (caption) t.appendChild(el("caption", caption));
    var tr = el("tr");
    head.forEach(function (h, i) {
      var th = el("th", null, i ? "num" : "");
      th.scope = "col";
      if (typeof h === "string") th.textContent = h;
      else th.appendChild(h);
      tr.appendChild(th);
    });
    var th = el("thead");
    th.appendChild(tr);
    t.appendChild(th);
    t.appendChild(tb);
    wrap.appendChild(t);
    parent.appendChild(wrap);
    return tb;
  }
  function row(tb, label, cells) {
    var tr = el("tr"),
      th = el("th", label);
    th.scope = "row";
    tr.appendChild(th);
    cells.forEach(function (c) {
      var td = el("td", null, "num");
      (Array.isArray(c) ? c : [c]).forEach(function (x) {
        if (x != null) td.appendChild(typeof x === "string" ? document.createTextNode(x) : x);
      });
      tr.appendChild(td);
    });
    tb.appendChild(tr);
  }
  function diff(v, ref, unit) {
    if (v == null || ref == null) return null;
    var d = v - ref;
    if (d === 0) return null;
    var pct = unit === "%";
    // Percentage metrics differ in percentage points; a relative change is shown only where it means something:
    // not for °C (an offset scale), percentages, or values of different sign or near zero.
    var text = "\u0394 " + (d > 0 ? "+" : "\u2212") + sci(Math.abs(d)) + (pct ? " percentage points" : unit ? " " + unit : "");
    var relative = !pct && !/°C|degC/.test(unit || "") && ref !== 0 && v * ref > 0 && Math.abs(ref) > 1e-9 * Math.abs(v);
    if (relative) text += " (" + (d > 0 ? "+" : "\u2212") + String(Number(Math.abs((100 * d) / ref).toPrecision(2))) + " %)";
    return el("div", text, "diff");
  }
  function chart(parent, id, title, spec, summary) {
    var fig = el("figure", null, "chart");
    fig.id = id;
    fig.appendChild(el("figcaption", title));
    var box = el("div", null, "canvas-box"),
      c = el("canvas");
    c.setAttribute("role", "img");
    c.setAttribute("aria-label", title + ". " + summary);
    box.appendChild(c);
    fig.appendChild(box);
    fig.appendChild(el("p", summary, "sr-only"));
    parent.appendChild(fig);
    if (typeof Chart !== "undefined" && window.waferbookPlot) window.waferbookPlot(c, spec);
  }

  function draw() {
    var ws = ids
      .filter(function (id) {
        return failed.indexOf(id) < 0;
      })
      .map(function (id) {
        return window.waferbookCompare[id];
      });
    if (failed.length) notes.push("The data of " + failed.join(", ") + " did not load (wafers/<id>/compare.js).");
    if (ws.length < 2) {
      status.textContent = notes.concat(["Nothing to compare."]).join(" ");
      return;
    }
    var ref = ws[0];
    status.textContent = notes
      .concat([
        "Comparing " +
          ws
            .map(function (w) {
              return w.id;
            })
            .join(", ") +
          "; differences (\u0394) are from " +
          ref.id +
          ".",
      ])
      .join(" ");
    var heads = function (first) {
      return [first].concat(
        ws.map(function (w) {
          var a = el("a", w.id);
          a.href = link("wafers/" + w.id + "/");
          return a;
        }),
      );
    };

    var s1 = section("overview", "Overview");
    var tb = table(s1, "The chosen wafers", heads("Wafer"));
    row(
      tb,
      "Run",
      ws.map(function (w) {
        return w.run;
      }),
    );
    row(
      tb,
      "Grown",
      ws.map(function (w) {
        return w.grown;
      }),
    );
    row(
      tb,
      "Grade",
      ws.map(function (w) {
        return w.grade;
      }),
    );
    row(
      tb,
      "Reactor",
      ws.map(function (w) {
        return w.reactor;
      }),
    );
    row(
      tb,
      "Verdict",
      ws.map(function (w) {
        return mark(w.verdict);
      }),
    );

    var s2 = section("metrics", "Metrics");
    tb = table(s2, "Each metric with its unit and verdict for the wafer's grade; \u0394 is the difference from " + ref.id, heads("Metric"));
    var keys = [],
      info = {};
    ws.forEach(function (w) {
      w.metrics.forEach(function (m) {
        if (!info[m.key]) {
          info[m.key] = m;
          keys.push(m.key);
        }
      });
    });
    keys.forEach(function (k) {
      var refM = ref.metrics.filter(function (m) {
        return m.key === k;
      })[0];
      row(
        tb,
        info[k].label + (info[k].unit ? " (" + info[k].unit + ")" : ""),
        ws.map(function (w, i) {
          var m = w.metrics.filter(function (x) {
            return x.key === k;
          })[0];
          if (!m) return "\u2014";
          return [m.text + " ", mark(m.verdict), i ? diff(m.value, refM?.value, info[k].unit) : null];
        }),
      );
    });

    if (
      ws.some(function (w) {
        return w.growth;
      })
    ) {
      var s3 = section("growth", "Growth conditions");
      tb = table(s3, "As recorded in each wafer.md; \u0394 from " + ref.id, heads("Condition"));
      row(
        tb,
        "Recipe",
        ws.map(function (w) {
          return w.growth ? w.growth.recipe || "\u2014" : "\u2014";
        }),
      );
      var gk = [],
        gi = {};
      ws.forEach(function (w) {
        (w.growth ? w.growth.values : []).forEach(function (v) {
          if (!gi[v.key]) {
            gi[v.key] = v;
            gk.push(v.key);
          }
        });
      });
      var valueFor = function (w, k) {
        var v = w.growth?.values.filter(function (x) {
          return x.key === k;
        })[0];
        return v ? v.value : null;
      };
      gk.forEach(function (k) {
        row(
          tb,
          gi[k].label + " (" + gi[k].unit + ")",
          ws.map(function (w, i) {
            var v = valueFor(w, k);
            return v == null ? "\u2014" : [sci(v), i ? diff(v, valueFor(ref, k), gi[k].unit) : null];
          }),
        );
      });
    }

    var s4 = section("hall", "Mobility against density");
    var series = ws
      .map(function (w, i) {
        return {
          label: w.id,
          style: i,
          points: w.hall.reduce(function (a, d) {
            return a.concat(d.points);
          }, []),
        };
      })
      .filter(function (s) {
        return s.points.length;
      });
    if (series.length)
      chart(
        s4,
        "chart-hall",
        "Hall mobility against sheet density, every device of each wafer",
        { x: { label: "Sheet density n (cm\u207b\u00b2)", log: true }, y: { label: "Hall mobility \u03bc (cm\u00b2/V s)", log: true }, series: series },
        series
          .map(function (s) {
            return (
              s.label +
              ": " +
              s.points.length +
              " points, highest mobility " +
              sci(
                Math.max.apply(
                  null,
                  s.points.map(function (q) {
                    return q[1];
                  }),
                ),
              ) +
              " cm\u00b2/V s"
            );
          })
          .join("; "),
      );
    else s4.appendChild(el("p", "None of the chosen wafers has Hall data."));

    var s5 = section("calibration", "Gate calibrations");
    var cal = [],
      calText = [];
    ws.forEach(function (w, i) {
      var pts = w.calibrations.reduce(function (a, d) {
        return a.concat(d.points);
      }, []);
      if (!pts.length) return;
      cal.push({ label: w.id, style: i, points: pts });
      w.calibrations.forEach(function (d) {
        if (!d.fit) return;
        var vmax = Math.max.apply(
          null,
          d.points.map(function (q) {
            return q[0];
          }),
        );
        cal.push({
          label: w.id + " " + d.device + " fit",
          style: i,
          line: true,
          points: [
            [d.fit.turnOn, 0],
            [vmax, d.fit.slope * (vmax - d.fit.turnOn)],
          ],
        });
        calText.push(w.id + " " + d.device + ": " + d.fit.text);
      });
    });
    if (cal.length) {
      chart(
        s5,
        "chart-calibration",
        "Hall density against gate voltage, with each device's linear fit",
        { x: { label: "Gate voltage Vg (V)" }, y: { label: "Sheet density n (10\u00b9\u00b9 cm\u207b\u00b2)" }, series: cal },
        calText.join("; ") || "No fits.",
      );
      var ul = el("ul");
      calText.forEach(function (t) {
        ul.appendChild(el("li", t));
      });
      s5.appendChild(ul);
    } else s5.appendChild(el("p", "None of the chosen wafers has a gate calibration."));

    var s6 = section("profiles", "Depth profiles");
    var prof = [];
    ws.forEach(function (w, i) {
      w.profiles.forEach(function (p, k) {
        if (p.points.length) prof.push({ label: w.id + " (" + p.method + (k ? " " + (k + 1) : "") + ")", style: i, line: true, points: p.points });
      });
    });
    if (prof.length)
      chart(
        s6,
        "chart-profiles",
        "Ge fraction against depth from the surface, on one depth axis",
        { x: { label: "Depth (nm)" }, y: { label: "Ge fraction" }, series: prof },
        prof
          .map(function (s) {
            return s.label + ": " + s.points.length + " depths to " + sci(s.points[s.points.length - 1][0]) + " nm";
          })
          .join("; "),
      );
    else s6.appendChild(el("p", "None of the chosen wafers has a depth profile."));

    var s7 = section("stacks", "Layer stacks (design)");
    var names = [];
    ws.forEach(function (w) {
      w.stack.forEach(function (l) {
        if (names.indexOf(l.name) < 0) names.push(l.name);
      });
    });
    if (names.length) {
      tb = table(s7, "From the surface down: material, Ge fraction, thickness", heads("Layer"));
      names.forEach(function (n) {
        row(
          tb,
          n,
          ws.map(function (w) {
            var l = w.stack.filter(function (x) {
              return x.name === n;
            })[0];
            if (!l) return "\u2014";
            return [l.material || l.role, l.ge != null ? ", Ge " + l.ge : "", l.thickness_nm != null ? ", " + sci(l.thickness_nm) + " nm" : ""].join("");
          }),
        );
      });
    } else s7.appendChild(el("p", "No layer stack recorded."));
  }
})();
