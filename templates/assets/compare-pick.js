// The wafer table's comparison choice: a checkbox in each row's wafer cell
// and a "Compare selected" button that opens compare/?w=A,B,… for 2 to 6
// ticked wafers. The choice survives sorting and filtering (rows are moved,
// not rebuilt); without JavaScript the table stays a plain table.
(function () {
  "use strict";
  var table = document.getElementById("wafer-table");
  var pick = document.getElementById("compare-pick");
  var button = document.getElementById("compare-selected");
  var said = document.getElementById("compare-picked");
  if (!table || !pick || !button || !said) return;
  var MAX = 6;
  var chosen = [];
  function update() {
    var n = chosen.length;
    button.disabled = n < 2 || n > MAX;
    said.textContent =
      n === 0
        ? "Tick 2 to " + MAX + " wafers in the table to compare them side by side."
        : n + " chosen (" + chosen.join(", ") + ")" + (n < 2 ? ": tick at least one more." : n > MAX ? ": at most " + MAX + " can be compared." : ".");
  }
  Array.prototype.forEach.call(table.tBodies[0].rows, function (r) {
    var cell = r.cells[0],
      a = cell?.querySelector("a");
    if (!a) return;
    var id = a.textContent.trim();
    var box = document.createElement("input");
    box.type = "checkbox";
    box.className = "pick";
    box.value = id;
    box.setAttribute("aria-label", "Compare " + id);
    box.addEventListener("change", function () {
      var i = chosen.indexOf(id);
      if (box.checked && i < 0) chosen.push(id);
      if (!box.checked && i >= 0) chosen.splice(i, 1);
      update();
    });
    cell.insertBefore(box, cell.firstChild);
    cell.insertBefore(document.createTextNode(" "), box.nextSibling);
  });
  button.addEventListener("click", function () {
    if (chosen.length < 2 || chosen.length > MAX) return;
    window.location.href = pick.getAttribute("data-href") + "?w=" + chosen.map(encodeURIComponent).join(",");
  });
  pick.hidden = false;
  update();
})();
