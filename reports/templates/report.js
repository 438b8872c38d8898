// Progressive enhancement only: the page is complete without this script.
(function () {
  'use strict';
  var controls = document.getElementById('controls');
  if (controls) controls.hidden = false;

  // Build filter: hide every element tagged with a build's index.
  Array.prototype.forEach.call(document.querySelectorAll('input[data-filter]'), function (box) {
    box.addEventListener('change', function () {
      document.body.classList.toggle('hide-b' + box.getAttribute('data-filter'), !box.checked);
    });
  });

  // Expand / collapse all scenario sections.
  Array.prototype.forEach.call(document.querySelectorAll('button[data-action]'), function (button) {
    button.addEventListener('click', function () {
      var open = button.getAttribute('data-action') === 'expand';
      Array.prototype.forEach.call(document.querySelectorAll('details.scenario'), function (d) { d.open = open; });
    });
  });

  // A link to a scenario opens its section.
  function openTarget() {
    var id = decodeURIComponent(location.hash.slice(1));
    var target = id && document.getElementById(id);
    if (target && target.tagName === 'DETAILS') target.open = true;
  }
  window.addEventListener('hashchange', openTarget);
  openTarget();

  // Hover read-out of time on time plots: a cursor line and the time under the pointer.
  var readout = document.createElement('div');
  readout.className = 'readout';
  readout.hidden = true;
  document.body.appendChild(readout);
  var NS = 'http://www.w3.org/2000/svg';
  Array.prototype.forEach.call(document.querySelectorAll('svg.plot[data-tmax]'), function (svg) {
    var t0 = Number(svg.getAttribute('data-t0'));
    var t1 = Number(svg.getAttribute('data-t1'));
    var tmax = Number(svg.getAttribute('data-tmax')) / 1000;
    var box = svg.viewBox.baseVal;
    var line = null;
    svg.addEventListener('mousemove', function (event) {
      var rect = svg.getBoundingClientRect();
      var x = ((event.clientX - rect.left) / rect.width) * box.width;
      if (x < t0 || x > t1) { readout.hidden = true; if (line) line.setAttribute('visibility', 'hidden'); return; }
      if (!line) {
        line = document.createElementNS(NS, 'path');
        line.setAttribute('stroke', '#22313f');
        line.setAttribute('stroke-width', '0.6');
        svg.appendChild(line);
      }
      line.setAttribute('d', 'M' + x.toFixed(1) + ' 0V' + box.height);
      line.setAttribute('visibility', 'visible');
      readout.textContent = 't = ' + ((x - t0) / (t1 - t0) * tmax).toFixed(2) + ' s';
      readout.style.left = event.clientX + 12 + 'px';
      readout.style.top = event.clientY - 10 + 'px';
      readout.hidden = false;
    });
    svg.addEventListener('mouseleave', function () {
      readout.hidden = true;
      if (line) line.setAttribute('visibility', 'hidden');
    });
  });
})();
