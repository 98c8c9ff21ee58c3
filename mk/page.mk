# The page served at GET / is built into greybodyd: tools/embed-page.sh joins
# server/page/ into one HTML document and writes its bytes where
# server/handlers_page.c includes them.  Included by the Makefile.

PAGE_SOURCES := $(wildcard server/page/*.html server/page/*.css server/page/*.js)
PAGE_BYTES   := $(BUILD)/gen/page_index.inc

$(PAGE_BYTES): $(PAGE_SOURCES) tools/embed-page.sh
	sh tools/embed-page.sh server/page/index.html $@

$(BUILD)/server/handlers_page.o: $(PAGE_BYTES)
$(BUILD)/server/handlers_page.o: ALL_CFLAGS += -I$(BUILD)/gen
