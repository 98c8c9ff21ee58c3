/*
 * Numbers for people: a few significant digits, powers of ten written with
 * superscripts (1.2·10⁻⁵) rather than "e" notation, and an em dash for a
 * missing value.
 */
(function (greybody) {
  "use strict";

  const SUPERSCRIPT = {"-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵",
                       "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹"};

  function superscript(text) {
    return String(text).split("").map((c) => SUPERSCRIPT[c] || c).join("");
  }

  function powerOfTen(exponent) {
    return "10" + superscript(exponent);
  }

  /* `digits` significant digits; scientific form outside [1e-3, 1e5). */
  function number(value, digits) {
    if (value === null || value === undefined || !Number.isFinite(value)) {
      return "—";
    }
    const magnitude = Math.abs(value);
    if (magnitude !== 0 && (magnitude >= 1e5 || magnitude < 1e-3)) {
      const [mantissa, exponent] = value.toExponential(digits - 1).split("e");
      return withMinus(mantissa) + "·" + powerOfTen(Number(exponent));
    }
    return withMinus(Number(value.toPrecision(digits)).toString());
  }

  /* The typographic minus sign, which lines up with the digits. */
  function withMinus(text) {
    return text.replace("-", "−");
  }

  /* A fixed number of decimals (temperatures, uncertainties). */
  function fixed(value, decimals) {
    if (value === null || value === undefined || !Number.isFinite(value)) {
      return "—";
    }
    return withMinus(value.toFixed(decimals));
  }

  greybody.format = {number, fixed, powerOfTen};
})(window.greybody = window.greybody || {});
