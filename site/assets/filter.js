// Progressive enhancement: a text filter over a variant table. Without script the full table shows.
(function () {
  "use strict";
  var inputs = document.querySelectorAll("input[data-filter-target]");
  Array.prototype.forEach.call(inputs, function (input) {
    var table = document.getElementById(input.getAttribute("data-filter-target"));
    if (!table || !table.tBodies[0]) return;
    var holder = input.closest("[hidden]");
    if (holder) holder.removeAttribute("hidden");
    var rows = Array.prototype.slice.call(table.tBodies[0].rows);
    input.addEventListener("input", function () {
      var words = input.value.toLowerCase().split(/\s+/).filter(Boolean);
      rows.forEach(function (row) {
        var text = row.textContent.toLowerCase();
        row.hidden = !words.every(function (w) { return text.indexOf(w) !== -1; });
      });
    });
  });
})();
