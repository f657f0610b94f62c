// The wafer table: sort by any column, filter by verdict, run, grade, reactor,
// growth date and free text; the state lives in the URL query so a filtered
// view can be linked. Without JavaScript the page is a plain table.
(function () {
  "use strict";
  var table = document.getElementById("wafer-table");
  var form = document.getElementById("wafer-filters");
  var count = document.getElementById("wafer-count");
  if (!table || !form || !count) return;
  var tbody = table.tBodies[0];
  var rows = Array.prototype.slice.call(tbody.rows);
  var heads = Array.prototype.slice.call(table.tHead.rows[0].cells);
  var selects = Array.prototype.slice.call(form.querySelectorAll("select[data-col]"));
  var from = document.getElementById("f-from"),
    to = document.getElementById("f-to"),
    text = document.getElementById("f-text");
  var state = { sort: -1, dir: "asc" };
  rows.forEach(function (r, i) {
    r.setAttribute("data-order", String(i));
  });

  // Filter choices from the rows themselves.
  selects.forEach(function (sel) {
    var col = sel.getAttribute("data-col"),
      seen = {};
    rows.forEach(function (r) {
      var v = r.getAttribute("data-" + col);
      if (v) seen[v] = true;
    });
    Object.keys(seen)
      .sort()
      .forEach(function (v) {
        var o = document.createElement("option");
        o.value = v;
        o.textContent = v;
        sel.appendChild(o);
      });
  });

  // Sort buttons in the column headers.
  heads.forEach(function (th, i) {
    var b = document.createElement("button");
    b.type = "button";
    b.className = "sort";
    b.textContent = th.textContent;
    var mark = document.createElement("span");
    mark.className = "sort-mark";
    mark.setAttribute("aria-hidden", "true");
    b.appendChild(mark);
    th.textContent = "";
    th.appendChild(b);
    b.addEventListener("click", function () {
      state.dir = state.sort === i && state.dir === "asc" ? "desc" : "asc";
      state.sort = i;
      apply(true);
    });
  });

  function cellKey(r, i) {
    var c = r.cells[i];
    if (!c) return "";
    var ds = c.getAttribute("data-sort");
    if (ds !== null) return ds === "" ? null : Number(ds);
    return c.textContent.trim().toLowerCase();
  }
  function compare(a, b) {
    var ka = cellKey(a, state.sort),
      kb = cellKey(b, state.sort);
    if (ka === null || ka === "" || ka === "—") return kb === null || kb === "" || kb === "—" ? 0 : 1;
    if (kb === null || kb === "" || kb === "—") return -1;
    var d = typeof ka === "number" && typeof kb === "number" ? ka - kb : String(ka).localeCompare(String(kb), undefined, { numeric: true });
    return state.dir === "asc" ? d : -d;
  }

  function visible(r) {
    for (var i = 0; i < selects.length; i++) {
      var v = selects[i].value;
      if (v && r.getAttribute("data-" + selects[i].getAttribute("data-col")) !== v) return false;
    }
    var g = r.getAttribute("data-grown") || "";
    if (from.value && (!g || g < from.value)) return false;
    if (to.value && (!g || g > to.value)) return false;
    var t = text.value.trim().toLowerCase();
    return !t || r.textContent.toLowerCase().indexOf(t) !== -1;
  }

  function writeUrl() {
    var p = new URLSearchParams();
    selects.forEach(function (s) {
      if (s.value) p.set(s.name, s.value);
    });
    if (from.value) p.set("from", from.value);
    if (to.value) p.set("to", to.value);
    if (text.value.trim()) p.set("text", text.value.trim());
    if (state.sort >= 0) {
      p.set("sort", String(state.sort));
      p.set("dir", state.dir);
    }
    var qs = p.toString();
    history.replaceState(null, "", location.pathname + (qs ? "?" + qs : "") + location.hash);
  }

  function readUrl() {
    var p = new URLSearchParams(location.search);
    selects.forEach(function (s) {
      var v = p.get(s.name);
      if (
        v &&
        Array.prototype.some.call(s.options, function (o) {
          return o.value === v;
        })
      )
        s.value = v;
    });
    from.value = p.get("from") || "";
    to.value = p.get("to") || "";
    text.value = p.get("text") || "";
    var s = Number(p.get("sort"));
    if (p.has("sort") && s >= 0 && s < heads.length) {
      state.sort = s;
      state.dir = p.get("dir") === "desc" ? "desc" : "asc";
    }
  }

  function apply(updateUrl) {
    var ordered = rows.slice();
    if (state.sort >= 0)
      ordered.sort(function (a, b) {
        return compare(a, b) || Number(a.getAttribute("data-order")) - Number(b.getAttribute("data-order"));
      });
    var shown = 0;
    ordered.forEach(function (r) {
      var ok = visible(r);
      r.hidden = !ok;
      if (ok) shown++;
      tbody.appendChild(r);
    });
    heads.forEach(function (th, i) {
      if (i === state.sort) th.setAttribute("aria-sort", state.dir === "asc" ? "ascending" : "descending");
      else th.removeAttribute("aria-sort");
      th.querySelector(".sort-mark").textContent = i === state.sort ? (state.dir === "asc" ? " \u25b4" : " \u25be") : "";
    });
    count.textContent = shown + " of " + rows.length + (rows.length === 1 ? " wafer" : " wafers") + " shown";
    if (updateUrl) writeUrl();
  }

  form.addEventListener("input", function () {
    apply(true);
  });
  form.addEventListener("change", function () {
    apply(true);
  });
  form.addEventListener("submit", function (e) {
    e.preventDefault();
  });
  form.addEventListener("reset", function () {
    setTimeout(function () {
      state.sort = -1;
      apply(true);
    }, 0);
  });
  readUrl();
  form.hidden = false;
  apply(false);
})();
