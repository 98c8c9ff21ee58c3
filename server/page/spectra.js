/*
 * The "Planck curves" view: the blackbody curves, their Wien peaks and the
 * share of each inside the shaded band from one /v1/spectrum request, and the
 * radiance inside the band from /v1/band.
 */
(function (greybody) {
  "use strict";

  /* Inks of our own, far enough apart to tell the curves from each other on screen and paper. */
  const CURVE_COLOURS = ["#0b6e69", "#b3471d", "#5b3f99", "#697a12", "#1f5fa8", "#a32c61",
                         "#8a6a12", "#3d4347"];
  const SAMPLES = 241;
  const LOG_DECADES_SHOWN = 7;
  const UNIT_SYMBOL = {K: "K", C: "°C", F: "°F"};

  function readForm() {
    const {fields} = greybody;
    const temperatures = fields.list("spectra-temperatures", "Temperatures", CURVE_COLOURS.length);
    const axis = fields.interval("spectra-from", "spectra-to", "Wavelength axis");
    if (axis[0] <= 0) {
      throw new fields.FieldError("Wavelength axis", "wavelengths must be above 0 µm.");
    }
    return {
      temperatures,
      unit: fields.choice("spectra-unit"),
      axis,
      band: fields.interval("band-from", "band-to", "Shaded band"),
      yscale: fields.choice("spectra-yscale"),
    };
  }

  async function ask(form) {
    const {api} = greybody;
    const spectrum = await api.post("/v1/spectrum", {
      temperatures: form.temperatures, temperature_unit: form.unit, wavelength_range: form.axis,
      points: SAMPLES, spacing: "linear", band: {wavelength: form.band}});
    const band = await api.post("/v1/band", {
      temperature: form.temperatures, temperature_unit: form.unit, band: {wavelength: form.band}});
    api.requireAllElements(band, (index) => "Temperature " + form.temperatures[index]);
    return {
      wavelengths: spectrum.wavelength,
      radiance: spectrum.curves.map((curve) => curve.radiance),
      peakWavelength: spectrum.curves.map((curve) => curve.peak_wavelength),
      peakRadiance: spectrum.curves.map((curve) => curve.peak_radiance),
      bandRadiance: api.asArray(band.radiance),
      bandFraction: spectrum.curves.map((curve) => curve.band_fraction),
    };
  }

  function radianceAxis(form, answer) {
    const shown = answer.radiance.flat().filter((v) => Number.isFinite(v) && v > 0);
    const highest = shown.length > 0 ? Math.max(...shown) : 1;
    const label = "Spectral radiance L (W m⁻² sr⁻¹ µm⁻¹)";
    if (form.yscale === "linear") {
      return {label, scale: "linear", min: 0, max: highest * 1.08};
    }
    const top = highest * 3;
    const lowest = shown.length > 0 ? Math.min(...shown) : highest / 10;
    const bottom = Math.max(Math.pow(10, Math.floor(Math.log10(lowest))),
                            Math.pow(10, Math.floor(Math.log10(top)) - LOG_DECADES_SHOWN));
    return {label, scale: "log", min: bottom, max: top};
  }

  function render(form, answer) {
    const symbol = UNIT_SYMBOL[form.unit];
    const name = (i) => greybody.format.number(form.temperatures[i], 6) + " " + symbol;
    greybody.chart.draw(document.getElementById("spectra-plot"), {
      title: "Planck curves for " + form.temperatures.map((_, i) => name(i)).join(", "),
      x: {label: "Wavelength λ (µm)", scale: "linear", min: form.axis[0], max: form.axis[1]},
      y: radianceAxis(form, answer),
      intervals: [{from: form.band[0], to: form.band[1],
                   label: form.band[0] + "–" + form.band[1] + " µm band"}],
      series: answer.radiance.map((values, i) => ({
        points: answer.wavelengths.map((w, j) => [w, values[j]]),
        colour: CURVE_COLOURS[i], label: name(i)})),
      markers: answer.peakWavelength.map((w, i) => ({
        x: w, y: answer.peakRadiance[i], colour: CURVE_COLOURS[i], label: name(i)})),
    });
    const rows = document.querySelector("#spectra-table tbody");
    rows.replaceChildren(...form.temperatures.map((_, i) => {
      const row = document.createElement("tr");
      const swatch = `<span class="swatch" style="background:${CURVE_COLOURS[i]}"></span>`;
      const cells = [
        greybody.format.number(answer.peakWavelength[i], 5),
        greybody.format.number(answer.peakRadiance[i], 5),
        greybody.format.number(answer.bandRadiance[i], 5),
        greybody.format.fixed(100 * answer.bandFraction[i], 2) + " %",
      ];
      row.innerHTML = `<th scope="row">${swatch}</th>` + cells.map((c) => `<td>${c}</td>`).join("");
      row.firstChild.append(name(i));
      return row;
    }));
  }

  function redraw() {
    return greybody.page.run("spectra-status", async () => {
      const form = readForm();
      return {form, answer: await ask(form)};
    }, ({form, answer}) => {
      render(form, answer);
      const count = form.temperatures.length;
      return count + (count === 1 ? " curve" : " curves") + " drawn.";
    });
  }

  function start() {
    greybody.page.onSubmit("spectra-form", redraw);
    for (const id of ["spectra-unit", "spectra-yscale"]) {
      document.getElementById(id).addEventListener("change", redraw);
    }
    return redraw();
  }

  greybody.spectra = {start, redraw};
})(window.greybody = window.greybody || {});
