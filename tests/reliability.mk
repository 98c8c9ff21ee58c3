# tests/reliability.mk — sanitizers, valgrind, fuzzing, load and soak (included by the Makefile).
#   make test-sanitize   unit + integration suites built with AddressSanitizer + UBSan
#   make test-valgrind   the integration suite against build/greybodyd under valgrind memcheck
#   make test-fuzz-smoke every libFuzzer harness for FUZZ_SMOKE_SECONDS each (CI)
#   make fuzz            every harness for FUZZ_SECONDS each (by hand; default 600)
#   make test-load       LOAD_SECONDS (default 20) of loopback load, values and memory checked
#   make soak            the same for SOAK_SECONDS (default 600)

SANITIZE_BUILD := build/sanitize
SANITIZE_FLAGS := -fsanitize=address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer
# Leaks, and any undefined behaviour, end the process with an error; the server's children inherit.
SANITIZE_ENV := ASAN_OPTIONS=detect_leaks=1:abort_on_error=0:exitcode=86:strict_string_checks=1 \
                UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1

FUZZ_BUILD := build/fuzz
FUZZ_CC := clang
FUZZ_FLAGS := -fsanitize=fuzzer-no-link,address,undefined -fno-sanitize-recover=all \
              -fno-omit-frame-pointer
FUZZ_HARNESS_SRC := $(wildcard tests/fuzz/fuzz_*.c)
FUZZ_HARNESSES := $(FUZZ_HARNESS_SRC:tests/fuzz/%.c=%)
FUZZ_SMOKE_SECONDS ?= 20
FUZZ_SECONDS ?= 600

LOAD_BIN := $(BUILD)/tests/load/load
LOAD_SECONDS ?= 20
SOAK_SECONDS ?= 600

TEST_SUITES += test-fuzz-smoke test-load test-sanitize test-valgrind

.PHONY: test-sanitize sanitize-suites test-valgrind fuzz-build test-fuzz-smoke fuzz test-load soak

test-sanitize:
	@$(MAKE) --no-print-directory BUILD=$(SANITIZE_BUILD) OPT=-O1 \
	    EXTRA_CFLAGS="$(SANITIZE_FLAGS)" sanitize-suites

# Runs inside the sanitized build (BUILD=$(SANITIZE_BUILD)).
sanitize-suites: all $(UNIT_BIN) $(INTEG_BIN)
	@$(SANITIZE_ENV) sh tools/run-tests.sh sanitize-unit $(UNIT_BIN)
	@$(SANITIZE_ENV) GREYBODYD=$(SERVER_BIN) sh tools/run-tests.sh sanitize-integration $(INTEG_BIN)

VALGRIND_SUITES := $(BUILD)/tests/integration/test_http $(BUILD)/tests/integration/test_bad_input

test-valgrind: all $(VALGRIND_SUITES)
	@GREYBODYD=tools/valgrind-greybodyd.sh GREYBODYD_UNDER_VALGRIND=$(SERVER_BIN) \
	    sh tools/run-tests.sh valgrind $(VALGRIND_SUITES) \
	    || { grep -h -B2 -A30 '==[0-9]*==' $(BUILD)/tests/integration/greybodyd.log \
	         $(BUILD)/tests/bad-input.log | tail -80; false; }

fuzz-build:
	@$(MAKE) --no-print-directory BUILD=$(FUZZ_BUILD) CC=$(FUZZ_CC) EXTRA_CFLAGS="$(FUZZ_FLAGS)" \
	    $(FUZZ_HARNESSES:%=$(FUZZ_BUILD)/tests/fuzz/%)

$(BUILD)/tests/fuzz/fuzz_%: tests/fuzz/fuzz_%.c $(BUILD)/tests/fuzz/reply_check.o $(CORE_LIB) \
                            $(SERVER_LIB_OBJ)
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -fsanitize=fuzzer -Icore -Iserver -Itests/fuzz $< \
	    $(BUILD)/tests/fuzz/reply_check.o $(SERVER_LIB_OBJ) $(CORE_LIB) $(SERVER_LDLIBS) -o $@

test-fuzz-smoke: fuzz-build
	@sh tools/fuzz-run.sh $(FUZZ_BUILD)/tests/fuzz $(FUZZ_SMOKE_SECONDS) $(FUZZ_HARNESSES)

fuzz: fuzz-build
	@sh tools/fuzz-run.sh $(FUZZ_BUILD)/tests/fuzz $(FUZZ_SECONDS) $(FUZZ_HARNESSES)

$(LOAD_BIN): tests/load/load.c $(TEST_SUPPORT_LIB)
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -Icore -Iserver -Itests/support $< $(TEST_SUPPORT_LIB) -lcurl -ljansson \
	    -lm -o $@

test-load: all $(LOAD_BIN)
	@GREYBODYD=$(SERVER_BIN) $(LOAD_BIN) --seconds $(LOAD_SECONDS)

soak: all $(LOAD_BIN)
	@GREYBODYD=$(SERVER_BIN) $(LOAD_BIN) --seconds $(SOAK_SECONDS)
