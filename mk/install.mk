# make install — for integrators and packagers (included by the Makefile):
#   make install PREFIX=/opt/greybody      (default /usr/local; DESTDIR= stages for a package)
# installs
#   PREFIX/bin/greybodyd                              the server
#   PREFIX/lib/libgreybody.a, libgreybody.so.N(.so)   the core, static and shared
#   PREFIX/include/greybody/*.h                       the public headers: #include <greybody/planck.h>
#   PREFIX/lib/pkgconfig/greybody.pc                  pkg-config --cflags --libs greybody
#   PREFIX/share/greybody/api-docs/openapi.{yaml,json}  the contract (served at /openapi.json)
#   PREFIX/share/greybody/shared/*.json               the band and material presets
# The installed server finds its files under PREFIX/share/greybody (server/datapath.h).
# `make uninstall` with the same PREFIX and DESTDIR removes exactly these.

PREFIX  ?= /usr/local
DESTDIR ?=
INSTALL_BIN     = $(DESTDIR)$(PREFIX)/bin
INSTALL_LIB     = $(DESTDIR)$(PREFIX)/lib
INSTALL_INCLUDE = $(DESTDIR)$(PREFIX)/include/greybody
INSTALL_DATA    = $(DESTDIR)$(PREFIX)/share/greybody

# Headers that only the core's own sources include: not part of the library's interface.
CORE_INTERNAL_HEADERS := core/quadrature.h core/solver.h
CORE_PUBLIC_HEADERS   := $(filter-out $(CORE_INTERNAL_HEADERS),$(wildcard core/*.h))
SHARED_DATA           := $(wildcard shared/*.json)

GREYBODY_RELEASE := $(shell sed -n 's/.*define GREYBODY_VERSION "\(.*\)".*/\1/p' server/version.h)
CORE_SONAME      := libgreybody.so.0
CORE_SHARED      := $(BUILD)/$(CORE_SONAME)
CORE_PIC_OBJ     := $(CORE_SRC:%.c=$(BUILD)/pic/%.o)
PKG_CONFIG_FILE  := $(BUILD)/greybody.pc

.PHONY: install uninstall

$(BUILD)/pic/%.o: %.c
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -fPIC -Icore -MMD -MP -c $< -o $@

$(CORE_SHARED): $(CORE_PIC_OBJ)
	$(CC) $(ALL_CFLAGS) -shared -Wl,-soname,$(CORE_SONAME) $^ $(LDLIBS_CORE) -o $@

$(PKG_CONFIG_FILE): mk/greybody.pc.in server/version.h
	@mkdir -p $(dir $@)
	sed -e 's|@PREFIX@|$(PREFIX)|' -e 's|@VERSION@|$(GREYBODY_RELEASE)|' $< > $@

# The prefix is written into greybody.pc, so a new PREFIX must rewrite it.
.PHONY: $(PKG_CONFIG_FILE)

install: all $(CORE_SHARED) $(PKG_CONFIG_FILE)
	install -d $(INSTALL_BIN) $(INSTALL_LIB)/pkgconfig $(INSTALL_INCLUDE) \
	    $(INSTALL_DATA)/api-docs $(INSTALL_DATA)/shared
	install -m 755 $(SERVER_BIN) $(INSTALL_BIN)/greybodyd
	install -m 644 $(CORE_LIB) $(INSTALL_LIB)/libgreybody.a
	install -m 755 $(CORE_SHARED) $(INSTALL_LIB)/$(CORE_SONAME)
	ln -sf $(CORE_SONAME) $(INSTALL_LIB)/libgreybody.so
	install -m 644 $(CORE_PUBLIC_HEADERS) $(INSTALL_INCLUDE)/
	install -m 644 $(PKG_CONFIG_FILE) $(INSTALL_LIB)/pkgconfig/greybody.pc
	install -m 644 api-docs/openapi.yaml api-docs/openapi.json $(INSTALL_DATA)/api-docs/
	$(if $(SHARED_DATA),install -m 644 $(SHARED_DATA) $(INSTALL_DATA)/shared/)

uninstall:
	rm -f $(INSTALL_BIN)/greybodyd $(INSTALL_LIB)/libgreybody.a $(INSTALL_LIB)/$(CORE_SONAME) \
	    $(INSTALL_LIB)/libgreybody.so $(INSTALL_LIB)/pkgconfig/greybody.pc \
	    $(CORE_PUBLIC_HEADERS:core/%=$(INSTALL_INCLUDE)/%) \
	    $(INSTALL_DATA)/api-docs/openapi.yaml $(INSTALL_DATA)/api-docs/openapi.json \
	    $(SHARED_DATA:shared/%=$(INSTALL_DATA)/shared/%)
	-rmdir $(INSTALL_INCLUDE) $(INSTALL_DATA)/api-docs $(INSTALL_DATA)/shared $(INSTALL_DATA) \
	    2>/dev/null
