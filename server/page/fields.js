/*
 * Reading the forms: text → numbers, with an error that names the field the
 * person has to fix.  Only the shape is checked here (is it a number, is the
 * list too long); the physics' domains are the server's to judge, and its
 * problem details are shown as they come.
 */
(function (greybody) {
  "use strict";

  class FieldError extends Error {
    constructor(field, message) {
      super(field + ": " + message);
      this.name = "FieldError";
      this.field = field;
    }
  }

  function parse(text, field) {
    const trimmed = String(text).trim().replace(/−/g, "-");
    if (trimmed === "") {
      throw new FieldError(field, "enter a number.");
    }
    const value = Number(trimmed);
    if (!Number.isFinite(value)) {
      throw new FieldError(field, "\"" + trimmed + "\" is not a number.");
    }
    return value;
  }

  /* The number in the input element with this id. */
  function number(id, field) {
    return parse(document.getElementById(id).value, field);
  }

  /* A list of numbers separated by commas, semicolons or spaces, 1 to `most` of them. */
  function list(id, field, most) {
    const text = document.getElementById(id).value;
    const parts = text.split(/[,;\s]+/).filter((part) => part !== "");
    if (parts.length === 0) {
      throw new FieldError(field, "enter at least one number.");
    }
    if (parts.length > most) {
      throw new FieldError(field, "at most " + most + " values, " + parts.length + " given.");
    }
    return parts.map((part) => parse(part, field));
  }

  /* Two numbers forming an interval lo < hi. */
  function interval(loId, hiId, field) {
    const lo = number(loId, field);
    const hi = number(hiId, field);
    if (!(lo < hi)) {
      throw new FieldError(field, "the first limit must be below the second.");
    }
    return [lo, hi];
  }

  function choice(id) {
    return document.getElementById(id).value;
  }

  greybody.fields = {number, list, interval, choice, FieldError};
})(window.greybody = window.greybody || {});
