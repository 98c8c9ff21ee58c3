/*
 * The page's only way to the numbers: POST a JSON body to this server's /v1
 * API and return the answer, or throw an error carrying the problem's detail
 * and the offending field (RFC 9457 problem details, see /openapi.json).
 */
(function (greybody) {
  "use strict";

  class ProblemError extends Error {
    constructor(message, field) {
      super(message);
      this.name = "ProblemError";
      this.field = field || null;
    }
  }

  async function post(path, body) {
    let response;
    try {
      response = await fetch(path, {
        method: "POST",
        headers: {"Content-Type": "application/json", "Accept": "application/json"},
        body: JSON.stringify(body),
      });
    } catch (error) {
      throw new ProblemError("The server could not be reached (" + error.message + ").");
    }
    let answer = null;
    try {
      answer = await response.json();
    } catch (error) {
      answer = null;
    }
    if (!response.ok) {
      if (answer && typeof answer.detail === "string") {
        const where = answer.field ? " (field " + answer.field + ")" : "";
        throw new ProblemError(answer.detail + where, answer.field);
      }
      throw new ProblemError("The server answered " + response.status + ".");
    }
    if (answer === null || typeof answer !== "object") {
      throw new ProblemError("The server's answer to " + path + " was not JSON.");
    }
    return answer;
  }

  /* An output that is an array for array inputs and a number for scalars, always as an array. */
  function asArray(value) {
    return Array.isArray(value) ? value : [value];
  }

  /*
   * Array requests succeed even when some elements are out of domain: those
   * come back as null with an entry in element_errors.  The first one becomes
   * an error naming the element, so the page never draws half a request.
   */
  function requireAllElements(answer, describeElement) {
    const errors = answer.element_errors;
    if (Array.isArray(errors) && errors.length > 0) {
      const first = errors[0];
      throw new ProblemError(describeElement(first.index) + ": " + first.detail, first.field);
    }
    return answer;
  }

  greybody.api = {post, asArray, requireAllElements, ProblemError};
})(window.greybody = window.greybody || {});
