# tests/deploy.mk — deployment, install, the built-in page and the contract (included by the Makefile).
#   make test-deploy   deploy/: systemd-analyze, the container build stage, Kubernetes YAML, nginx -t
#   make test-install  make install into a temporary PREFIX; a program built with pkg-config
#   make test-scale    three instances behind nginx under wrk load, one killed: no failed request
#   make test-browser  the page at / in headless Chromium (screenshots in build/browser/)
#   make test-spec     the OpenAPI validator, answers against the contract, promtool on /metrics
# Each prints "<suite>: N passed, M failed".  The npm packages install from the committed lock files.

TEST_SUITES += test-deploy test-install test-scale test-browser test-spec

BROWSER_MODULES := tests/browser/node_modules/.package-lock.json
SPEC_MODULES    := tests/spec/node_modules/.package-lock.json
SPEC_OUTPUT     := $(BUILD)/tests/spec

.PHONY: test-deploy test-install test-scale test-browser test-spec

$(BROWSER_MODULES) $(SPEC_MODULES): %/node_modules/.package-lock.json: %/package-lock.json %/package.json
	cd $* && npm ci --no-audit --no-fund --loglevel=error
	@touch $@

test-deploy: all
	@$(PYTHON_REF) tests/deploy/check_deploy.py

test-install: all
	@$(PYTHON_REF) tests/install/test_install.py

test-scale: all
	@$(PYTHON_REF) tests/deploy/test_scale.py

test-browser: all $(BROWSER_MODULES)
	@mkdir -p $(BUILD)/browser
	@node --test --test-reporter=tap tests/browser/page.test.mjs > $(BUILD)/browser/tap.txt 2>&1; \
	    status=$$?; cat $(BUILD)/browser/tap.txt; \
	    awk '/^# pass /{p=$$3} /^# fail /{f=$$3} END {printf "browser: %d passed, %d failed\n", p, f}' \
	        $(BUILD)/browser/tap.txt; \
	    echo "screenshots: $(BUILD)/browser/planck-curves.png $(BUILD)/browser/uncertainty.png"; \
	    exit $$status

# The integration suite runs once more here with its answers recorded (its own verdict counts in
# test-integration), then the recorded answers are checked against the contract.
test-spec: all $(BUILD)/tests/integration/test_http $(SPEC_MODULES)
	@mkdir -p $(SPEC_OUTPUT)
	@rm -f $(SPEC_OUTPUT)/responses.jsonl
	@GREYBODY_RESPONSE_LOG=$(SPEC_OUTPUT)/responses.jsonl $(BUILD)/tests/integration/test_http \
	    > $(SPEC_OUTPUT)/test_http.log 2>&1 || true
	@GREYBODY_RESPONSE_LOG=$(SPEC_OUTPUT)/responses.jsonl $(PYTHON_REF) tests/spec/check_spec.py
