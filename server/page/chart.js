/*
 * Line charts drawn as inline SVG: a frame with ticks and labelled axes
 * (linear or logarithmic), line series in which a null value breaks the line,
 * round markers with a label, and hatched intervals along x.  No library, so
 * the page needs nothing but this server.  The parts a test or a reader may
 * look for carry classes: path.curve, circle.marker, rect.interval.
 *
 * spec = {title, x: {label, scale: "linear" | "log", min, max}, y: {same},
 *         series: [{points: [[x, y], ...], colour, label}],
 *         markers: [{x, y, colour, label}], intervals: [{from, to, label}],
 *         zeroLines: bool}
 */
(function (greybody) {
  "use strict";

  const SVG = "http://www.w3.org/2000/svg";
  const WIDTH = 880;
  const HEIGHT = 460;
  const MARGIN = {left: 92, right: 30, top: 24, bottom: 64};
  const TARGET_TICKS = 8;

  function add(parent, name, attributes, text) {
    const node = document.createElementNS(SVG, name);
    for (const [key, value] of Object.entries(attributes || {})) {
      node.setAttribute(key, String(value));
    }
    if (text !== undefined) {
      node.textContent = text;
    }
    parent.appendChild(node);
    return node;
  }

  /* value → pixel along one axis; null where the value has no place (≤ 0 on a log axis). */
  function makeScale(axis, from, to) {
    const log = axis.scale === "log";
    const lo = log ? Math.log10(axis.min) : axis.min;
    const hi = log ? Math.log10(axis.max) : axis.max;
    return (value) => {
      if (value === null || !Number.isFinite(value) || (log && value <= 0)) {
        return null;
      }
      const v = log ? Math.log10(value) : value;
      return from + (v - lo) / (hi - lo) * (to - from);
    };
  }

  function linearTicks(min, max) {
    const raw = (max - min) / TARGET_TICKS;
    const power = Math.pow(10, Math.floor(Math.log10(raw)));
    const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((s) => s >= raw * (1 - 1e-9));
    const ticks = [];
    for (let k = Math.ceil(min / step - 1e-9); k * step <= max + step * 1e-9; k++) {
      const value = k * step;
      ticks.push({value, label: greybody.format.number(value, 4)});
    }
    return ticks;
  }

  /* Decades, thinned when there are many; with two decades or fewer also 2× and 5×. */
  function logTicks(min, max) {
    const first = Math.ceil(Math.log10(min) - 1e-9);
    const last = Math.floor(Math.log10(max) + 1e-9);
    const decades = last - first + 1;
    if (decades <= 2) {
      const ticks = [];
      for (let e = first - 1; e <= last; e++) {
        for (const m of [1, 2, 5]) {
          const value = m * Math.pow(10, e);
          if (value >= min * (1 - 1e-9) && value <= max * (1 + 1e-9)) {
            ticks.push({value, label: greybody.format.number(value, 3)});
          }
        }
      }
      return ticks;
    }
    /* A grid line at every decade; labels thinned so that they do not crowd. */
    const every = Math.max(1, Math.ceil(decades / TARGET_TICKS));
    const ticks = [];
    for (let e = first; e <= last; e++) {
      const labelled = (e - first) % every === 0;
      ticks.push({value: Math.pow(10, e), label: labelled ? greybody.format.powerOfTen(e) : ""});
    }
    return ticks;
  }

  function ticksOf(axis) {
    return axis.scale === "log" ? logTicks(axis.min, axis.max) : linearTicks(axis.min, axis.max);
  }

  function drawAxes(svg, spec, box, x, y) {
    const grid = add(svg, "g", {class: "grid"});
    const labels = add(svg, "g", {class: "tick-labels"});
    for (const tick of ticksOf(spec.x)) {
      const px = x(tick.value);
      add(grid, "line", {x1: px, y1: box.top, x2: px, y2: box.bottom});
      add(grid, "line", {x1: px, y1: box.bottom, x2: px, y2: box.bottom + 5, class: "tick"});
      add(labels, "text", {x: px, y: box.bottom + 20, "text-anchor": "middle"}, tick.label);
    }
    for (const tick of ticksOf(spec.y)) {
      const py = y(tick.value);
      add(grid, "line", {x1: box.left, y1: py, x2: box.right, y2: py});
      add(grid, "line", {x1: box.left - 5, y1: py, x2: box.left, y2: py, class: "tick"});
      if (tick.label !== "") {
        add(labels, "text", {x: box.left - 9, y: py + 4, "text-anchor": "end"}, tick.label);
      }
    }
    add(svg, "rect", {class: "frame", x: box.left, y: box.top, width: box.right - box.left,
                      height: box.bottom - box.top});
    add(svg, "text", {class: "axis-label", x: (box.left + box.right) / 2, y: HEIGHT - 16,
                      "text-anchor": "middle"}, spec.x.label);
    const middle = (box.top + box.bottom) / 2;
    add(svg, "text", {class: "axis-label", x: 20, y: middle, "text-anchor": "middle",
                      transform: `rotate(-90 20 ${middle})`}, spec.y.label);
  }

  function drawIntervals(area, spec, box, x, hatchId) {
    for (const interval of spec.intervals || []) {
      const from = Math.max(box.left, Math.min(box.right, x(interval.from)));
      const to = Math.max(box.left, Math.min(box.right, x(interval.to)));
      if (to - from < 0.5) {
        continue;
      }
      add(area, "rect", {class: "interval", x: from, y: box.top, width: to - from,
                         height: box.bottom - box.top, fill: `url(#${hatchId})`});
      add(area, "text", {class: "interval-label", x: (from + to) / 2, y: box.top + 16,
                         "text-anchor": "middle"}, interval.label);
    }
  }

  function drawZeroLines(area, box, x, y) {
    const px = x(0);
    const py = y(0);
    if (px !== null && px > box.left && px < box.right) {
      add(area, "line", {class: "zero-line", x1: px, y1: box.top, x2: px, y2: box.bottom});
    }
    if (py !== null && py > box.top && py < box.bottom) {
      add(area, "line", {class: "zero-line", x1: box.left, y1: py, x2: box.right, y2: py});
    }
  }

  function pathData(points, x, y) {
    let d = "";
    let penDown = false;
    let vertices = 0;
    for (const [vx, vy] of points) {
      const px = x(vx);
      const py = y(vy);
      if (px === null || py === null) {
        penDown = false;
        continue;
      }
      d += (penDown ? "L" : "M") + px.toFixed(2) + " " + py.toFixed(2);
      penDown = true;
      vertices++;
    }
    return {d, vertices};
  }

  function drawSeries(area, spec, x, y) {
    for (const series of spec.series || []) {
      const {d, vertices} = pathData(series.points, x, y);
      const path = add(area, "path", {class: "curve", d: d || "M0 0", stroke: series.colour,
                                      "data-vertices": vertices});
      add(path, "title", {}, series.label);
    }
  }

  function drawMarkers(svg, spec, box, x, y) {
    const layer = add(svg, "g", {class: "markers"});
    for (const marker of spec.markers || []) {
      const px = x(marker.x);
      const py = y(marker.y);
      if (px === null || py === null || px < box.left || px > box.right || py < box.top ||
          py > box.bottom) {
        continue;
      }
      add(layer, "line", {class: "marker-drop", x1: px, y1: py, x2: px, y2: box.bottom,
                          stroke: marker.colour});
      add(layer, "circle", {class: "marker", cx: px, cy: py, r: 5, stroke: marker.colour,
                            "data-x": marker.x, "data-y": marker.y});
      const nearRight = px > box.right - 90;
      add(layer, "text", {class: "marker-label", x: px + (nearRight ? -9 : 9), y: py - 9,
                          "text-anchor": nearRight ? "end" : "start", fill: marker.colour},
          marker.label);
    }
  }

  function draw(svg, spec) {
    svg.replaceChildren();
    svg.setAttribute("viewBox", `0 0 ${WIDTH} ${HEIGHT}`);
    svg.setAttribute("role", "img");
    svg.setAttribute("aria-label", spec.title);
    const box = {left: MARGIN.left, right: WIDTH - MARGIN.right, top: MARGIN.top,
                 bottom: HEIGHT - MARGIN.bottom};
    const x = makeScale(spec.x, box.left, box.right);
    const y = makeScale(spec.y, box.bottom, box.top);
    const clipId = svg.id + "-area";
    const hatchId = svg.id + "-hatch";

    const defs = add(svg, "defs");
    add(add(defs, "clipPath", {id: clipId}), "rect",
        {x: box.left, y: box.top, width: box.right - box.left, height: box.bottom - box.top});
    const hatch = add(defs, "pattern", {id: hatchId, width: 7, height: 7,
                                        patternUnits: "userSpaceOnUse",
                                        patternTransform: "rotate(40)"});
    add(hatch, "rect", {class: "hatch-ground", width: 7, height: 7});
    add(hatch, "line", {class: "hatch-line", x1: 0, y1: 0, x2: 0, y2: 7});

    add(svg, "rect", {class: "plot-ground", x: box.left, y: box.top,
                      width: box.right - box.left, height: box.bottom - box.top});
    drawAxes(svg, spec, box, x, y);
    const area = add(svg, "g", {"clip-path": `url(#${clipId})`});
    drawIntervals(area, spec, box, x, hatchId);
    if (spec.zeroLines) {
      drawZeroLines(area, box, x, y);
    }
    drawSeries(area, spec, x, y);
    drawMarkers(svg, spec, box, x, y);
  }

  greybody.chart = {draw};
})(window.greybody = window.greybody || {});
