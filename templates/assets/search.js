// Site search: loads /search-index.json (built at build time) with MiniSearch
// and lists matches that link to the wafer or run section that matched.
(function () {
  "use strict";
  var form = document.getElementById("search-form");
  if (!form || typeof MiniSearch === "undefined") return;
  var base = form.getAttribute("data-base") || "/";
  var input = document.getElementById("search-q");
  var status = document.getElementById("search-status");
  var list = document.getElementById("search-results");
  var q = new URLSearchParams(location.search).get("q") || "";
  input.value = q;
  var SECTION = { notes: ["notes", "Notes"], reasons: ["summary", "Why"], verdict: ["summary", "Verdict"], grade: ["summary", "Grade"], run: ["summary", "Run"], title: ["summary", "Summary"] };
  function anchorFor(hit) {
    var fields = {};
    Object.keys(hit.match).forEach(function (t) { hit.match[t].forEach(function (f) { fields[f] = true; }); });
    if (hit.kind === "run") return fields.notes ? ["notes", "Notes"] : ["wafers", "Wafers"];
    var order = ["title", "run", "verdict", "grade", "reasons", "notes"];
    for (var i = 0; i < order.length; i++) if (fields[order[i]]) return SECTION[order[i]];
    return SECTION.title;
  }
  function show(ms) {
    list.textContent = "";
    if (!q.trim()) return;
    var hits = ms.search(q, { prefix: true, fuzzy: 0.2, boost: { title: 3, run: 2 } });
    status.textContent = hits.length + (hits.length === 1 ? " match" : " matches") + " for \u201c" + q + "\u201d";
    hits.slice(0, 50).forEach(function (hit) {
      var where = anchorFor(hit);
      var li = document.createElement("li");
      var a = document.createElement("a");
      a.href = base + hit.href + "#" + where[0];
      a.textContent = (hit.kind === "run" ? "Run " : "Wafer ") + hit.title;
      li.appendChild(a);
      var info = document.createElement("span");
      info.className = "reason";
      info.textContent = " \u2014 " + where[1] + (hit.kind === "wafer" ? " \u00b7 run " + hit.run + " \u00b7 " + hit.verdict : "");
      li.appendChild(info);
      list.appendChild(li);
    });
  }
  fetch(base + "search-index.json").then(function (r) {
    if (!r.ok) throw new Error("HTTP " + r.status);
    return r.json();
  }).then(function (data) {
    show(MiniSearch.loadJS(data.index, data.options));
  }).catch(function (e) {
    status.textContent = "The search index could not be loaded (" + e.message + ").";
  });
})();
