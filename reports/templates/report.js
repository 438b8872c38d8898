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

  var NS = 'http://www.w3.org/2000/svg';

  // Time window: every time plot of a scenario shows the same window [a, b] (seconds). Without
  // this script the plots show the whole run, which is also what "Full run" returns to.
  function plotGeometry(svg) {
    return { t0: Number(svg.getAttribute('data-t0')), t1: Number(svg.getAttribute('data-t1')), tmax: Number(svg.getAttribute('data-tmax')) / 1000 };
  }
  function niceStep(span, count) {
    var raw = span / Math.max(1, count);
    var power = Math.pow(10, Math.floor(Math.log(raw) / Math.LN10));
    var steps = [1, 2, 2.5, 5, 10];
    for (var i = 0; i < steps.length; i++) if (steps[i] * power >= raw) return steps[i] * power;
    return 10 * power;
  }
  function drawTicks(svg, g, a, b) {
    var axis = svg.querySelector('g.taxis');
    if (!axis) return;
    var y = Number(axis.getAttribute('data-y'));
    while (axis.firstChild) axis.removeChild(axis.firstChild);
    var step = niceStep(b - a, 6);
    var digits = step < 0.01 ? 3 : step < 0.1 ? 2 : step < 1 ? 1 : 0;
    for (var t = Math.ceil(a / step - 1e-9) * step; t <= b + 1e-9; t += step) {
      var x = g.t0 + ((t - a) / (b - a)) * (g.t1 - g.t0);
      var tick = document.createElementNS(NS, 'path');
      tick.setAttribute('d', 'M' + x.toFixed(1) + ' ' + y + 'v3');
      tick.setAttribute('stroke', '#1f2328');
      axis.appendChild(tick);
      var text = document.createElementNS(NS, 'text');
      text.setAttribute('x', x.toFixed(1));
      text.setAttribute('y', String(y + 12));
      text.setAttribute('text-anchor', 'middle');
      text.textContent = String(Number(t.toFixed(digits)));
      axis.appendChild(text);
    }
    var unit = document.createElementNS(NS, 'text');
    unit.setAttribute('x', String(g.t0 - 10));
    unit.setAttribute('y', String(y + 12));
    unit.setAttribute('text-anchor', 'end');
    unit.setAttribute('class', 'unit');
    unit.textContent = 't (s)';
    axis.appendChild(unit);
  }
  function windowOf(svg) {
    var w = (svg.getAttribute('data-window') || '').split(' ');
    var g = plotGeometry(svg);
    return w.length === 2 ? { a: Number(w[0]), b: Number(w[1]) } : { a: 0, b: g.tmax };
  }
  function applyWindow(section, a, b) {
    var plots = section.querySelectorAll('svg.plot[data-tmax]');
    var full = false;
    Array.prototype.forEach.call(plots, function (svg) {
      var g = plotGeometry(svg);
      var lo = Math.max(0, Math.min(a, b));
      var hi = Math.min(g.tmax, Math.max(a, b));
      if (!(hi - lo > 1e-6)) { lo = 0; hi = g.tmax; }
      full = lo <= 0 && hi >= g.tmax;
      var s = (g.t1 - g.t0) / g.tmax;
      var k = g.tmax / (hi - lo);
      var c = g.t0 - k * (g.t0 + s * lo);
      Array.prototype.forEach.call(svg.querySelectorAll('g.tz'), function (group) {
        if (full) group.removeAttribute('transform');
        else group.setAttribute('transform', 'matrix(' + k.toFixed(6) + ' 0 0 1 ' + c.toFixed(3) + ' 0)');
      });
      // End markers sit at each run's end, outside the zoomed group: shown for the full run only.
      Array.prototype.forEach.call(svg.querySelectorAll('g.ends'), function (ends) { ends.style.display = full ? '' : 'none'; });
      if (full) svg.removeAttribute('data-window');
      else svg.setAttribute('data-window', lo.toFixed(4) + ' ' + hi.toFixed(4));
      drawTicks(svg, g, lo, hi);
    });
    var zoom = section.querySelector('.zoom');
    if (zoom && plots.length > 0) {
      var w = windowOf(plots[0]);
      zoom.querySelector('.zoom-from').value = String(Number(w.a.toFixed(3)));
      zoom.querySelector('.zoom-to').value = String(Number(w.b.toFixed(3)));
    }
  }
  Array.prototype.forEach.call(document.querySelectorAll('details.scenario'), function (section) {
    var zoom = section.querySelector('.zoom');
    if (!zoom) return;
    var tmax = Number(zoom.getAttribute('data-tmax')) / 1000;
    var from = zoom.querySelector('.zoom-from');
    var to = zoom.querySelector('.zoom-to');
    to.value = String(tmax);
    from.max = to.max = String(tmax);
    zoom.hidden = false;
    function fromInputs() { applyWindow(section, Number(from.value) || 0, Number(to.value) || tmax); }
    from.addEventListener('change', fromInputs);
    to.addEventListener('change', fromInputs);
    zoom.querySelector('.zoom-reset').addEventListener('click', function () { applyWindow(section, 0, tmax); });
    // Brush: drag across any time plot of the scenario to choose the window.
    Array.prototype.forEach.call(section.querySelectorAll('svg.plot[data-tmax]'), function (svg) {
      var startX = null;
      var band = null;
      function localX(event) {
        var rect = svg.getBoundingClientRect();
        return ((event.clientX - rect.left) / rect.width) * svg.viewBox.baseVal.width;
      }
      svg.addEventListener('mousedown', function (event) {
        var g = plotGeometry(svg);
        var x = localX(event);
        if (x < g.t0 || x > g.t1) return;
        event.preventDefault();
        startX = x;
        band = document.createElementNS(NS, 'rect');
        band.setAttribute('y', '0');
        band.setAttribute('height', String(svg.viewBox.baseVal.height));
        band.setAttribute('fill', '#2f5c89');
        band.setAttribute('fill-opacity', '0.15');
        band.setAttribute('class', 'brush');
        svg.appendChild(band);
      });
      svg.addEventListener('mousemove', function (event) {
        if (startX === null || !band) return;
        var x = localX(event);
        band.setAttribute('x', Math.min(startX, x).toFixed(1));
        band.setAttribute('width', Math.abs(x - startX).toFixed(1));
      });
      function finish(event) {
        if (startX === null) return;
        var g = plotGeometry(svg);
        var x = Math.max(g.t0, Math.min(g.t1, localX(event)));
        if (band) svg.removeChild(band);
        band = null;
        var w = windowOf(svg);
        var toTime = function (px) { return w.a + ((px - g.t0) / (g.t1 - g.t0)) * (w.b - w.a); };
        if (Math.abs(x - startX) > 3) applyWindow(section, toTime(Math.min(startX, x)), toTime(Math.max(startX, x)));
        startX = null;
      }
      svg.addEventListener('mouseup', finish);
      svg.addEventListener('mouseleave', function (event) { if (startX !== null) finish(event); });
    });
  });

  // Take-away: each plot saved as SVG, and each time plot's series as CSV (read back from the
  // drawn paths: x by the plot's time range, y by the path's data-y map, so the file holds
  // exactly what is plotted).
  function download(name, type, text) {
    var link = document.createElement('a');
    var url = URL.createObjectURL(new Blob([text], { type: type }));
    link.href = url;
    link.download = name;
    document.body.appendChild(link);
    link.click();
    document.body.removeChild(link);
    setTimeout(function () { URL.revokeObjectURL(url); }, 1000);
  }
  var SVG_STYLE = 'text{font-size:9px;fill:#5d6168;font-family:system-ui,sans-serif}text.foot{fill:#1f2328;font-weight:600}.tz path{vector-effect:non-scaling-stroke}';
  function svgText(svg) {
    var copy = svg.cloneNode(true);
    copy.setAttribute('xmlns', NS);
    var defs = document.createElementNS(NS, 'defs');
    var seen = {};
    var queue = [copy];
    while (queue.length) {
      var node = queue.shift();
      var refs = (node.outerHTML || '').match(/(?:href="#|url\(#)([A-Za-z0-9_-]+)/g) || [];
      refs.forEach(function (ref) {
        var id = ref.replace(/^(?:href="#|url\(#)/, '');
        if (seen[id] || copy.querySelector('[id="' + id + '"]')) return;
        seen[id] = true;
        var found = document.getElementById(id);
        if (found) { var clone = found.cloneNode(true); defs.appendChild(clone); queue.push(clone); }
      });
    }
    var style = document.createElementNS(NS, 'style');
    style.textContent = SVG_STYLE;
    copy.insertBefore(style, copy.firstChild);
    copy.insertBefore(defs, copy.firstChild);
    var brush = copy.querySelectorAll('.brush, .cursor');
    Array.prototype.forEach.call(brush, function (b) { b.parentNode.removeChild(b); });
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + new XMLSerializer().serializeToString(copy);
  }
  function pathPoints(d) {
    var points = [];
    var x = 0;
    var y = 0;
    var re = /([MLlHhVv])([^MLlHhVv]*)/g;
    var m;
    while ((m = re.exec(d))) {
      var v = m[2].trim().split(/[\s,]+/).filter(Boolean).map(Number);
      if (m[1] === 'M' || m[1] === 'L') { x = v[0]; y = v[1]; points.push([x, y]); }
      else if (m[1] === 'l') { x += v[0]; y += v[1]; points.push([x, y]); }
      else if (m[1] === 'v') { y += v[0]; points.push([x, y]); }
      else if (m[1] === 'V') { y = v[0]; points.push([x, y]); }
      // h only draws the tick of a lone point (path.ts); it is not data.
      else if (m[1] === 'h') { x += v[0]; }
      else if (m[1] === 'H') { x = v[0]; }
    }
    return points;
  }
  function csvText(svg) {
    var g = plotGeometry(svg);
    var rows = ['series,t_s,value'];
    Array.prototype.forEach.call(svg.querySelectorAll('path.series[data-y]'), function (path) {
      var map = path.getAttribute('data-y').split(' ').map(Number);
      var name = '"' + path.getAttribute('data-name').replace(/"/g, '""') + '"';
      pathPoints(path.getAttribute('d')).forEach(function (p) {
        var t = ((p[0] - g.t0) / (g.t1 - g.t0)) * g.tmax;
        var value = map[2] + ((map[0] - p[1]) / (map[0] - map[1])) * (map[3] - map[2]);
        rows.push(name + ',' + Number(t.toPrecision(6)) + ',' + Number(value.toPrecision(6)));
      });
    });
    return rows.join('\n') + '\n';
  }
  Array.prototype.forEach.call(document.querySelectorAll('figure.panel'), function (figure, n) {
    var svg = figure.querySelector('svg.plot');
    if (!svg) return;
    var section = figure.closest('details.scenario');
    var base = (section ? section.id : 'plot') + '-' + (svg.getAttribute('class') || 'plot').replace(/^plot /, '').replace(/\s+/g, '-') + '-' + n;
    var bar = document.createElement('span');
    bar.className = 'take';
    var save = document.createElement('button');
    save.type = 'button';
    save.className = 'save-svg';
    save.textContent = 'SVG';
    save.title = 'Save this plot as SVG';
    save.addEventListener('click', function () { download(base + '.svg', 'image/svg+xml', svgText(svg)); });
    bar.appendChild(save);
    if (svg.querySelector('path.series[data-y]')) {
      var csv = document.createElement('button');
      csv.type = 'button';
      csv.className = 'save-csv';
      csv.textContent = 'CSV';
      csv.title = 'Save the plotted series as CSV';
      csv.addEventListener('click', function () { download(base + '.csv', 'text/csv', csvText(svg)); });
      bar.appendChild(csv);
    }
    (figure.querySelector('figcaption') || figure).appendChild(bar);
  });

  // Hover read-out of time on time plots: a cursor line and the time under the pointer.
  var readout = document.createElement('div');
  readout.className = 'readout';
  readout.hidden = true;
  document.body.appendChild(readout);
  Array.prototype.forEach.call(document.querySelectorAll('svg.plot[data-tmax]'), function (svg) {
    var t0 = Number(svg.getAttribute('data-t0'));
    var t1 = Number(svg.getAttribute('data-t1'));
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
        line.setAttribute('class', 'cursor');
        svg.appendChild(line);
      }
      var w = windowOf(svg);
      line.setAttribute('d', 'M' + x.toFixed(1) + ' 0V' + box.height);
      line.setAttribute('visibility', 'visible');
      readout.textContent = 't = ' + (w.a + ((x - t0) / (t1 - t0)) * (w.b - w.a)).toFixed(2) + ' s';
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
