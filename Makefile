# greybody — build, test and run.  GNU make.
#   make          build the core library and the server
#   make run      install what is missing, build, serve on 127.0.0.1:8080
#   make test     install what is missing, build, run every test
#   make deps     only install what is missing (Debian 12)
#   make install  PREFIX=... DESTDIR=...: server, core library, headers, greybody.pc (mk/install.mk)

CC      ?= cc
BUILD   ?= build
OPT     ?= -O2
CFLAGS  ?= $(OPT) -g
WARN    := -std=c11 -D_POSIX_C_SOURCE=200809L -Wall -Wextra -Werror -Wpedantic -Wshadow \
           -Wstrict-prototypes -Wmissing-prototypes -Wpointer-arith -Wcast-qual -Wvla
ALL_CFLAGS = $(WARN) $(CFLAGS) $(EXTRA_CFLAGS)
LDLIBS_CORE := -lm

CORE_SRC   := $(wildcard core/*.c)
CORE_OBJ   := $(CORE_SRC:%.c=$(BUILD)/%.o)
CORE_LIB   := $(BUILD)/libgreybody.a

SERVER_SRC := $(wildcard server/*.c)
SERVER_OBJ := $(SERVER_SRC:%.c=$(BUILD)/%.o)
SERVER_LIB_OBJ := $(filter-out $(BUILD)/server/main.o,$(SERVER_OBJ))
SERVER_BIN := $(BUILD)/greybodyd
SERVER_LDLIBS := -lmicrohttpd -ljansson -lpthread -lm

UNIT_SRC   := $(wildcard tests/unit/test_*.c)
UNIT_BIN   := $(UNIT_SRC:tests/unit/%.c=$(BUILD)/tests/unit/%)
INTEG_SRC  := $(wildcard tests/integration/test_*.c)
INTEG_BIN  := $(INTEG_SRC:tests/integration/%.c=$(BUILD)/tests/integration/%)
TEST_SUPPORT_SRC := $(wildcard tests/support/*.c)
TEST_SUPPORT_OBJ := $(TEST_SUPPORT_SRC:%.c=$(BUILD)/%.o)
# An archive, so that each test links only the helpers it uses (and only their libraries).
TEST_SUPPORT_LIB := $(BUILD)/libtestsupport.a

PYTHON_REF ?= /usr/bin/python3
LISTEN     ?= 127.0.0.1:8080

.PHONY: all core server deps run test test-unit test-reference test-integration clean

all: $(CORE_LIB) $(if $(SERVER_SRC),$(SERVER_BIN))

core: $(CORE_LIB)
server: $(SERVER_BIN)

$(BUILD)/%.o: %.c
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -Icore -Iserver -Itests/support -MMD -MP -c $< -o $@

$(CORE_LIB): $(CORE_OBJ)
	@mkdir -p $(dir $@)
	rm -f $@
	ar rcs $@ $^

$(SERVER_BIN): $(SERVER_OBJ) $(CORE_LIB)
	$(CC) $(ALL_CFLAGS) $(SERVER_OBJ) $(CORE_LIB) $(SERVER_LDLIBS) -o $@

$(TEST_SUPPORT_LIB): $(TEST_SUPPORT_OBJ)
	rm -f $@
	ar rcs $@ $^

$(BUILD)/tests/unit/%: tests/unit/%.c $(CORE_LIB) $(TEST_SUPPORT_LIB)
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -Icore -Itests/support $< $(TEST_SUPPORT_LIB) $(CORE_LIB) -lcmocka -lm -o $@

$(BUILD)/tests/integration/%: tests/integration/%.c $(CORE_LIB) $(TEST_SUPPORT_LIB) $(SERVER_BIN)
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -Icore -Iserver -Itests/support $< $(TEST_SUPPORT_LIB) $(SERVER_LIB_OBJ) \
	    $(CORE_LIB) -lcmocka -lcurl $(SERVER_LDLIBS) -o $@

deps:
	@sh tools/deps.sh

# deps plus the tools only tests need (clang, valgrind, openssl).
deps-test:
	@sh tools/deps.sh --test

run: deps all
	@echo "greybody: serving on http://$(LISTEN)/  (Ctrl-C stops)"
	exec $(SERVER_BIN) --listen $(LISTEN)

# Every suite `make test` runs; other makefile sections append theirs (TEST_SUITES += ...).
TEST_SUITES := test-unit test-reference test-integration

test: deps-test
	@$(MAKE) --no-print-directory all $(UNIT_BIN) $(INTEG_BIN)
	@bash tools/test-all.sh $(BUILD)/test.log $(TEST_SUITES)

test-unit: $(UNIT_BIN)
	@sh tools/run-tests.sh unit $(UNIT_BIN)

test-reference:
	@$(PYTHON_REF) tests/reference/generate.py --check
	@$(PYTHON_REF) tests/reference/workflows.py --check
	@$(PYTHON_REF) tests/reference/calibration.py --check

test-integration: $(INTEG_BIN)
	@$(PYTHON_REF) tests/integration/check_openapi.py
	@sh tools/run-tests.sh integration $(INTEG_BIN)

include tests/reliability.mk
include mk/page.mk mk/install.mk tests/deploy.mk
include mk/bench.mk

clean:
	rm -rf $(BUILD)

-include $(shell find $(BUILD) -name '*.d' 2>/dev/null)
