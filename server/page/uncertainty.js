/*
 * The "corrected temperature & uncertainty" view: one /v1/sensitivity call
 * gives the emissivity-corrected surface temperature, its GUM budget (JCGM
 * 100:2008) and the exact temperature error over a range of emissivity errors,
 * which is drawn.
 */
(function (greybody) {
  "use strict";

  const ERROR_POINTS = 81;
  const UNIT_SYMBOL = {K: "K", C: "°C", F: "°F"};
  const CURVE_COLOUR = "#b3471d";
  /* Budget rows by the field names the server uses; `temperature` marks inputs in temperature_unit. */
  const QUANTITIES = {
    emissivity: {label: "Emissivity ε", temperature: false},
    reflected_temperature: {label: "Reflected temperature", temperature: true},
    transmittance: {label: "Transmittance τ", temperature: false},
    atmosphere_temperature: {label: "Atmosphere temperature", temperature: true},
    apparent_temperature: {label: "Apparent temperature", temperature: true},
  };

  function readForm() {
    const {fields} = greybody;
    const model = fields.choice("u-model");
    const span = fields.number("u-span", "Emissivity errors to plot");
    if (!(span > 0 && span <= 1)) {
      throw new fields.FieldError("Emissivity errors to plot", "give a span above 0, at most 1.");
    }
    const body = {
      temperature_unit: fields.choice("u-unit"),
      model,
      apparent_temperature: fields.number("u-apparent", "Apparent temperature"),
      u_apparent_temperature: fields.number("u-apparent-u", "u(apparent temperature)"),
      emissivity: fields.number("u-emissivity", "Emissivity"),
      u_emissivity: fields.number("u-emissivity-u", "u(emissivity)"),
      reflected_temperature: fields.number("u-reflected", "Reflected temperature"),
      u_reflected_temperature: fields.number("u-reflected-u", "u(reflected temperature)"),
      transmittance: fields.number("u-transmittance", "Transmittance"),
      u_transmittance: fields.number("u-transmittance-u", "u(transmittance)"),
      atmosphere_temperature: fields.number("u-atmosphere", "Atmosphere temperature"),
      u_atmosphere_temperature: fields.number("u-atmosphere-u", "u(atmosphere temperature)"),
      emissivity_errors: Array.from({length: ERROR_POINTS}, (_, i) =>
        Number((-span + 2 * span * i / (ERROR_POINTS - 1)).toFixed(6))),
    };
    if (model === "band") {
      body.band = {wavelength: fields.interval("u-band-from", "u-band-to", "Band")};
    }
    return body;
  }

  function show(id, visible) {
    document.getElementById(id).hidden = !visible;
  }

  function renderBudget(body, answer) {
    const symbol = UNIT_SYMBOL[body.temperature_unit];
    const variance = answer.combined_standard_uncertainty ** 2;
    const rows = answer.budget.map((row) => {
      const quantity = QUANTITIES[row.quantity] || {label: row.quantity, temperature: false};
      const share = variance > 0 ? row.contribution ** 2 / variance : 0;
      const tr = document.createElement("tr");
      const cells = [
        greybody.format.number(row.standard_uncertainty, 4) + (quantity.temperature ? " " + symbol : ""),
        greybody.format.number(row.sensitivity, 5) + (quantity.temperature ? "" : " " + symbol),
        greybody.format.fixed(row.contribution, 3) + " " + symbol,
      ];
      const th = document.createElement("th");
      th.scope = "row";
      th.textContent = quantity.label;
      tr.append(th);
      for (const text of cells) {
        const td = document.createElement("td");
        td.textContent = text;
        tr.append(td);
      }
      const shareCell = document.createElement("td");
      shareCell.className = "share";
      const track = document.createElement("span");
      track.className = "share-track";
      const bar = document.createElement("span");
      bar.className = "share-bar";
      bar.style.width = (100 * share).toFixed(1) + "%";
      track.append(bar);
      const figure = document.createElement("span");
      figure.className = "share-figure";
      figure.textContent = greybody.format.fixed(100 * share, 1) + " %";
      shareCell.append(track, figure);
      tr.append(shareCell);
      return tr;
    });
    document.querySelector("#budget-table tbody").replaceChildren(...rows);
  }

  function renderCurve(body, answer) {
    const symbol = UNIT_SYMBOL[body.temperature_unit];
    const curve = answer.emissivity_error;
    const errors = curve.temperature_error.filter((v) => Number.isFinite(v));
    const reach = errors.length > 0 ? Math.max(...errors.map(Math.abs)) : 1;
    const deltas = curve.delta;
    greybody.chart.draw(document.getElementById("error-plot"), {
      title: "Temperature error against emissivity error",
      x: {label: "Emissivity error Δε (dimensionless)", scale: "linear",
          min: deltas[0], max: deltas[deltas.length - 1]},
      y: {label: "Temperature error ΔT (" + symbol + ")", scale: "linear",
          min: -reach * 1.1 || -1, max: reach * 1.1 || 1},
      intervals: body.u_emissivity > 0
        ? [{from: -body.u_emissivity, to: body.u_emissivity, label: "± u(ε)"}] : [],
      series: [{points: deltas.map((d, i) => [d, curve.temperature_error[i]]),
                colour: CURVE_COLOUR, label: "T(ε + Δε) − T(ε)"}],
      zeroLines: true,
    });
  }

  function render(body, answer) {
    const symbol = UNIT_SYMBOL[body.temperature_unit];
    document.getElementById("u-temperature").textContent =
      greybody.format.fixed(answer.temperature, 2) + " " + symbol;
    document.getElementById("u-expanded").textContent =
      greybody.format.fixed(answer.expanded_uncertainty, 2) + " " + symbol;
    document.getElementById("u-combined").textContent =
      greybody.format.fixed(answer.combined_standard_uncertainty, 3) + " " + symbol;
    renderBudget(body, answer);
    renderCurve(body, answer);
    for (const id of ["uncertainty-result", "budget-table", "error-figure"]) {
      show(id, true);
    }
  }

  function compute() {
    return greybody.page.run("uncertainty-status", async () => {
      const body = readForm();
      return {body, answer: await greybody.api.post("/v1/sensitivity", body)};
    }, ({body, answer}) => {
      render(body, answer);
      return "Computed with the " + answer.model + " model.";
    });
  }

  function start() {
    greybody.page.onSubmit("uncertainty-form", compute);
    return compute();
  }

  greybody.uncertainty = {start, compute};
})(window.greybody = window.greybody || {});
