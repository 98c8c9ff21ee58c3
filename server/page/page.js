/*
 * The page as a whole: the two views behind tabs, the round trip and status
 * line each view reports to, and the start-up that draws both views once.
 */
(function (greybody) {
  "use strict";

  function status(id, message, isError) {
    const line = document.getElementById(id);
    line.textContent = message;
    line.classList.toggle("is-error", Boolean(isError));
  }

  const newestRun = {};

  /*
   * One round trip of a view: `ask` (async: read the form, call the API) then
   * `show` (draw, return the message for the status line).  When a person asks
   * again before the answer is back, only the newest answer is shown; any
   * error goes to the status line as it is, the last drawing left standing.
   */
  async function run(statusId, ask, show) {
    const mine = (newestRun[statusId] || 0) + 1;
    newestRun[statusId] = mine;
    try {
      status(statusId, "Asking the server…", false);
      const answer = await ask();
      if (newestRun[statusId] === mine) {
        status(statusId, show(answer), false);
      }
    } catch (error) {
      if (newestRun[statusId] === mine) {
        status(statusId, error.message, true);
      }
    }
  }

  /* `action` on the form's submit (the page never navigates away). */
  function onSubmit(formId, action) {
    document.getElementById(formId).addEventListener("submit", (event) => {
      event.preventDefault();
      action();
    });
  }

  function select(tab) {
    for (const other of document.querySelectorAll('[role="tab"]')) {
      const chosen = other === tab;
      other.setAttribute("aria-selected", String(chosen));
      other.tabIndex = chosen ? 0 : -1;
      document.getElementById(other.getAttribute("aria-controls")).hidden = !chosen;
    }
  }

  function startTabs() {
    const tabs = Array.from(document.querySelectorAll('[role="tab"]'));
    tabs.forEach((tab, index) => {
      tab.addEventListener("click", () => select(tab));
      tab.addEventListener("keydown", (event) => {
        const step = {ArrowRight: 1, ArrowLeft: -1}[event.key];
        if (step) {
          const next = tabs[(index + step + tabs.length) % tabs.length];
          select(next);
          next.focus();
        }
      });
    });
  }

  greybody.page = {status, run, onSubmit};

  startTabs();
  Promise.all([greybody.spectra.start(), greybody.uncertainty.start()]).then(() => {
    document.body.dataset.ready = "true";
  });
})(window.greybody = window.greybody || {});
