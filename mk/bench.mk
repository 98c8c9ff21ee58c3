# `make bench`: speed against NumPy/SciPy, the one-exp() floor and nginx, measured side by side
# (tools/bench/bench.py writes the table to $(BUILD)/bench.md).  Not part of `make test`.
# Installs its peers first: nginx and wrk from Debian, through tools/deps.sh.

BENCH_PACKAGES := nginx wrk
BENCH_CORE     := $(BUILD)/bench/bench_core

.PHONY: bench

$(BENCH_CORE): tools/bench/bench_core.c $(CORE_LIB)
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -Icore $< $(CORE_LIB) -lm -o $@

bench:
	@GREYBODY_EXTRA_PACKAGES="$(BENCH_PACKAGES)" sh tools/deps.sh
	@$(MAKE) --no-print-directory all $(BENCH_CORE)
	@$(PYTHON_REF) tools/bench/bench.py $(BUILD)
