// Progressive enhancement for variant tables: a text filter, and one select per axis column
// (supply, current, chain, load, verdict, simulation) built from the table's own cells, so the
// options always match what is listed. Without script the full table shows.
(function () {
  "use strict";
  function cellText(row, i) {
    var c = row.cells[i];
    return c ? c.textContent.replace(/\s+/g, " ").trim() : "";
  }
  function wire(table, input, holder) {
    var rows = Array.prototype.slice.call(table.tBodies[0].rows);
    var heads = Array.prototype.slice.call(table.tHead ? table.tHead.rows[0].cells : []);
    var selects = [];
    if (holder) {
      heads.forEach(function (th, i) {
        if (!th.hasAttribute("data-axis")) return;
        var values = [];
        rows.forEach(function (r) {
          var t = cellText(r, i);
          if (t && values.indexOf(t) === -1) values.push(t);
        });
        if (values.length < 2) return;
        var id = table.id + "-axis-" + i;
        var wrap = document.createElement("span");
        var label = document.createElement("label");
        label.htmlFor = id;
        label.textContent = th.textContent.trim();
        var sel = document.createElement("select");
        sel.id = id;
        var all = document.createElement("option");
        all.value = "";
        all.textContent = "all";
        sel.appendChild(all);
        values.forEach(function (v) {
          var o = document.createElement("option");
          o.value = v;
          o.textContent = v;
          sel.appendChild(o);
        });
        wrap.appendChild(label);
        wrap.appendChild(sel);
        holder.appendChild(wrap);
        selects.push({ index: i, el: sel });
        sel.addEventListener("change", apply);
      });
      if (selects.length) holder.removeAttribute("hidden");
    }
    if (input) input.addEventListener("input", apply);
    function apply() {
      var words = input ? input.value.toLowerCase().split(/\s+/).filter(Boolean) : [];
      rows.forEach(function (row) {
        var text = row.textContent.toLowerCase();
        var ok = words.every(function (w) {
          return text.indexOf(w) !== -1;
        });
        ok =
          ok &&
          selects.every(function (s) {
            return !s.el.value || cellText(row, s.index) === s.el.value;
          });
        row.hidden = !ok;
      });
    }
  }
  var inputs = document.querySelectorAll("input[data-filter-target]");
  Array.prototype.forEach.call(inputs, function (input) {
    var table = document.getElementById(input.getAttribute("data-filter-target"));
    if (!table || !table.tBodies[0]) return;
    var p = input.closest("[hidden]");
    if (p) p.removeAttribute("hidden");
    wire(table, input, document.querySelector('[data-axis-filter-for="' + table.id + '"]'));
  });
})();
