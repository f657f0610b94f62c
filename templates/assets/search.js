// Site search: loads the index built at build time (assets/search-index.js,
// which sets window.waferbookSearchIndex; a script rather than fetched JSON so
// that search works on pages opened from disk) with MiniSearch and lists
// matches that link to the wafer or run section that matched.
(function () {
  "use strict";
  var form = document.getElementById("search-form");
  if (!form || typeof MiniSearch === "undefined") return;
  // The site root from this page: "../" when links are relative (they name index.html, as a folder
  // URL opened from disk shows a file listing), or the base path such as "/qual/" (tidy folder URLs).
  var root = form.getAttribute("data-root") || "";
  var relative = root.charAt(0) !== "/";
  function link(href) {
    return root + href + (relative && (href === "" || href.slice(-1) === "/") ? "index.html" : "");
  }
  var input = document.getElementById("search-q");
  var status = document.getElementById("search-status");
  var list = document.getElementById("search-results");
  var q = new URLSearchParams(location.search).get("q") || "";
  input.value = q;
  var SECTION = {
    notes: ["notes", "Notes"],
    reasons: ["summary", "Why"],
    verdict: ["summary", "Verdict"],
    grade: ["summary", "Grade"],
    run: ["summary", "Run"],
    title: ["summary", "Summary"],
  };
  function anchorFor(hit) {
    var fields = {};
    Object.keys(hit.match).forEach(function (t) {
      hit.match[t].forEach(function (f) {
        fields[f] = true;
      });
    });
    if (hit.kind === "run") return fields.notes ? ["notes", "Notes"] : ["wafers", "Wafers"];
    var order = ["title", "run", "verdict", "grade", "reasons", "notes"];
    for (var i = 0; i < order.length; i++) if (fields[order[i]]) return SECTION[order[i]];
    return SECTION.title;
  }
  // A short piece of the matched text (reasons or notes) around the first match, the matched
  // words in <mark>. Built from text nodes only: the stored text is never parsed as HTML.
  var SNIPPET_SIDE = 70;
  function escapeRe(t) {
    return t.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  }
  function snippet(hit) {
    var terms = (hit.terms || []).filter(function (t) {
      return t.length > 0;
    });
    if (!terms.length) return null;
    var re = new RegExp("(^|[^\\p{L}\\p{N}])(" + terms.map(escapeRe).join("|") + ")(?![\\p{L}\\p{N}])", "giu");
    var fields = ["notes", "reasons"];
    for (var i = 0; i < fields.length; i++) {
      var text = hit[fields[i]];
      if (!text) continue;
      re.lastIndex = 0;
      var m = re.exec(text);
      if (!m) continue;
      var at = m.index + m[1].length;
      var from = Math.max(0, at - SNIPPET_SIDE),
        to = Math.min(text.length, at + SNIPPET_SIDE);
      if (from > 0) {
        var sp = text.indexOf(" ", from);
        if (sp > 0 && sp < at) from = sp + 1;
      }
      if (to < text.length) {
        var sp2 = text.lastIndexOf(" ", to);
        if (sp2 > at) to = sp2;
      }
      var piece = text.slice(from, to);
      var p = document.createElement("p");
      p.className = "snippet";
      if (from > 0) p.appendChild(document.createTextNode("\u2026"));
      var last = 0,
        mm;
      re.lastIndex = 0;
      // biome-ignore lint/suspicious/noAssignInExpressions: the usual RegExp.exec loop
      while ((mm = re.exec(piece)) !== null) {
        var start = mm.index + mm[1].length;
        p.appendChild(document.createTextNode(piece.slice(last, start)));
        var mark = document.createElement("mark");
        mark.textContent = mm[2];
        p.appendChild(mark);
        last = start + mm[2].length;
        if (mm[0].length === 0) re.lastIndex++;
      }
      p.appendChild(document.createTextNode(piece.slice(last)));
      if (to < text.length) p.appendChild(document.createTextNode("\u2026"));
      return p;
    }
    return null;
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
      a.href = link(hit.href) + "#" + where[0];
      a.textContent = (hit.kind === "run" ? "Run " : "Wafer ") + hit.title;
      li.appendChild(a);
      var info = document.createElement("span");
      info.className = "reason";
      info.textContent = " \u2014 " + where[1] + (hit.kind === "wafer" ? " \u00b7 run " + hit.run + " \u00b7 " + hit.verdict : "");
      li.appendChild(info);
      var snip = snippet(hit);
      if (snip) li.appendChild(snip);
      list.appendChild(li);
    });
  }
  var data = window.waferbookSearchIndex;
  if (!data) {
    status.textContent = "The search index (assets/search-index.js) did not load, so search cannot run; the wafer table and run list still work.";
    return;
  }
  show(MiniSearch.loadJS(data.index, data.options));
})();
