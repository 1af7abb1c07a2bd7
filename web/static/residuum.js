// Residuum page script (progressive enhancement; every page works without it).
// When the progress poll swaps in the finished status of a run, go to its result.
document.addEventListener("htmx:afterSettle", function () {
  var done = document.querySelector("#job-status[data-result-url]");
  if (done) {
    window.location.assign(done.getAttribute("data-result-url"));
  }
});
