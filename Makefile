# holdfast - quasi-static mooring analysis.  Plain GNU make.
# Settings first; everything below them is mechanics.

PREFIX   ?= /usr/local
DESTDIR  ?=
BINDIR   ?= $(PREFIX)/bin
LIBDIR   ?= $(PREFIX)/lib
INCLUDEDIR ?= $(PREFIX)/include
MANDIR   ?= $(PREFIX)/share/man
PKGCONFIGDIR ?= $(LIBDIR)/pkgconfig
# The Python package goes where the system Python (PYTHON) looks: Debian's
# /usr/lib/python3/dist-packages for PREFIX=/usr, else
# PREFIX/lib/python3.X/dist-packages (on sys.path for /usr/local); any other
# PREFIX needs PYTHONPATH, or set PYTHON_SITE.  docs/library.md.
PYTHON   ?= /usr/bin/python3
PYTHON_SITE ?= $(if $(filter /usr,$(PREFIX)),$(PREFIX)/lib/python3/dist-packages,$(PREFIX)/lib/python$(shell $(PYTHON) -c 'import sys; print("%d.%d" % sys.version_info[:2])' 2>/dev/null || echo 3)/dist-packages)
CC       ?= cc
OPT      ?= -O2 -g
SANITIZE ?=
PKGS      = gsl yaml-0.1
VERSION   = 0.1.0
# Shared library version: the soname is libholdfast.so.$(SO_MAJOR); the major
# number changes when a public function or struct changes incompatibly
# (docs/library.md, "Versioning").
SO_MAJOR  = 1
SO_VERSION = $(SO_MAJOR).0.0

WARN  = -Wall
WARN += -Wextra
WARN += -Wpedantic
WARN += -Wshadow
WARN += -Wstrict-prototypes
WARN += -Wmissing-prototypes
WARN += -Wno-unused-parameter
WERROR ?= -Werror

BUILD ?= build

# Goals that build nothing need no packages: the dependency check and
# pkg-config run only when some other goal (or the default, all) is asked for.
NOBUILD_GOALS = clean help uninstall format format-check lint
BUILDING := $(filter-out $(NOBUILD_GOALS),$(or $(MAKECMDGOALS),all))

ifneq ($(BUILDING),)
# Missing development packages are reported (or installed, as root) here,
# before any compiler error can hide the real cause.
DEPS_OK := $(shell PYTHON=$(PYTHON) sh scripts/ensure-deps.sh >&2 && echo yes)
ifneq ($(DEPS_OK),yes)
$(error missing packages: see the message above)
endif
PKG_CFLAGS := $(shell pkg-config --cflags $(PKGS))
PKG_LIBS   := $(shell pkg-config --libs $(PKGS))
CMOCKA_CFLAGS := $(shell pkg-config --cflags cmocka)
CMOCKA_LIBS   := $(shell pkg-config --libs cmocka)
endif

# The project's own flags live in HF_* variables; the user's CPPFLAGS,
# CFLAGS, OPT, LDFLAGS and LDLIBS are appended, so `make CFLAGS=-O0` changes
# the optimisation but keeps C11, the warnings, -Werror and OpenMP.
OMP ?= -fopenmp
HF_CPPFLAGS = -Iinclude -DHF_VERSION=\"$(VERSION)\"
HF_CFLAGS   = -std=c11 -D_XOPEN_SOURCE=700 $(WARN) $(WERROR) $(OMP) $(PKG_CFLAGS)
HF_LDFLAGS  =
HF_LDLIBS   = $(PKG_LIBS) $(OMP) -lm
ifneq ($(SANITIZE),)
HF_CFLAGS  += -fsanitize=$(SANITIZE) -fno-omit-frame-pointer -fno-sanitize-recover=all
HF_LDFLAGS += -fsanitize=$(SANITIZE)
endif
ALL_CFLAGS  = $(HF_CPPFLAGS) $(CPPFLAGS) $(HF_CFLAGS) $(OPT) $(CFLAGS)
ALL_LDFLAGS = $(HF_LDFLAGS) $(LDFLAGS)
ALL_LDLIBS  = $(HF_LDLIBS) $(LDLIBS)

# The program is src/main.c, src/cli.c and src/cmd_*.c (the only code that
# prints); every other src/*.c is the library, build/libholdfast.a.  Test
# programs link the library; those listed in CMD_TESTS also link the
# command objects, explicitly.
CMD_SRC  := src/cli.c $(wildcard src/cmd_*.c)
CMD_OBJ  := $(CMD_SRC:src/%.c=$(BUILD)/obj/%.o)
LIB_SRC  := $(filter-out src/main.c $(CMD_SRC),$(wildcard src/*.c))
LIB_OBJ  := $(LIB_SRC:src/%.c=$(BUILD)/obj/%.o)
TEST_SRC := $(wildcard tests/test_*.c)
TEST_BIN := $(TEST_SRC:tests/%.c=$(BUILD)/%)
TEST_SUPPORT := $(filter-out $(TEST_SRC),$(wildcard tests/*.c))
TEST_SUPPORT_OBJ := $(TEST_SUPPORT:tests/%.c=$(BUILD)/tobj/%.o)
CMD_TESTS = cli report
LIB      := $(BUILD)/libholdfast.a
BIN      := $(BUILD)/holdfast
# The shared library: the same library sources compiled -fPIC into a
# directory of their own, linked with GSL, libyaml, libm and OpenMP, and
# exporting only the hf_* names (mk/libholdfast.map).  SHLIB is the real
# file; SHLIB_SONAME and SHLIB_DEV are the symlinks the loader and the
# linker (-lholdfast) look for.
PIC_OBJ  := $(LIB_SRC:src/%.c=$(BUILD)/picobj/%.o)
SHLIB_MAP    = mk/libholdfast.map
SHLIB        := $(BUILD)/libholdfast.so.$(SO_VERSION)
SHLIB_SONAME := $(BUILD)/libholdfast.so.$(SO_MAJOR)
SHLIB_DEV    := $(BUILD)/libholdfast.so
# -z defs: every symbol the library uses must come from a library it links,
# so a user links -lholdfast only.  Sanitizer runtimes are resolved by the
# program that loads the library, so that check is off in those builds.
SHLIB_DEFS := $(if $(SANITIZE),,-Wl,-z,defs)

# A target whose recipe fails is deleted, never left half-built.
.DELETE_ON_ERROR:
.PHONY: all check demo clean install uninstall debug tests help FORCE
all: $(BIN) $(SHLIB_DEV)

# Every object depends on $(BUILD)/flags, which changes only when the
# compiler or a flag does: a build with other flags rebuilds everything.
FLAGS_NOW := $(CC) $(ALL_CFLAGS) $(CMOCKA_CFLAGS) | $(ALL_LDFLAGS) | $(ALL_LDLIBS)
ifneq ($(BUILDING),)
ifneq ($(FLAGS_NOW),$(file <$(BUILD)/flags))
$(shell mkdir -p $(BUILD))
$(file >$(BUILD)/flags,$(FLAGS_NOW))
endif
endif

# (Recreated here when a goal such as `clean all` removed it after parsing.)
$(BUILD)/flags:
	$(shell mkdir -p $(dir $@))$(file >$@,$(FLAGS_NOW))

$(BUILD)/obj/%.o: src/%.c $(BUILD)/flags
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -MMD -MP -c $< -o $@

$(BUILD)/picobj/%.o: src/%.c $(BUILD)/flags
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -fPIC -MMD -MP -c $< -o $@

$(BUILD)/tobj/%.o: tests/%.c $(BUILD)/flags
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) $(CMOCKA_CFLAGS) -MMD -MP -c $< -o $@

$(LIB): $(LIB_OBJ)
	@rm -f $@
	$(AR) rcs $@ $^

$(SHLIB): $(PIC_OBJ) $(SHLIB_MAP)
	$(CC) -shared -Wl,-soname,libholdfast.so.$(SO_MAJOR) -Wl,--version-script=$(SHLIB_MAP) \
	    $(SHLIB_DEFS) $(ALL_LDFLAGS) -o $@ $(PIC_OBJ) $(ALL_LDLIBS)

$(SHLIB_SONAME): $(SHLIB)
	ln -sf $(notdir $<) $@

$(SHLIB_DEV): $(SHLIB_SONAME)
	ln -sf $(notdir $<) $@

$(BIN): $(BUILD)/obj/main.o $(CMD_OBJ) $(LIB)
	$(CC) $(ALL_LDFLAGS) -o $@ $^ $(ALL_LDLIBS)

$(CMD_TESTS:%=$(BUILD)/test_%): $(CMD_OBJ)

# The test programs of SHLIB_TESTS link the shared library as a user does
# (-lholdfast, nothing else of holdfast's), found next to them at run time
# through $$ORIGIN: test_shlib, and test_session, whose API is what the
# Python package loads.
SHLIB_TESTS = shlib session
$(SHLIB_TESTS:%=$(BUILD)/test_%): $(BUILD)/test_%: $(BUILD)/tobj/test_%.o $(TEST_SUPPORT_OBJ) $(SHLIB_DEV)
	$(CC) $(ALL_LDFLAGS) -o $@ $(filter %.o,$^) -L$(BUILD) -Wl,-rpath,'$$ORIGIN' -lholdfast \
	    $(CMOCKA_LIBS) -pthread -lm

$(BUILD)/test_%: $(BUILD)/tobj/test_%.o $(TEST_SUPPORT_OBJ) $(LIB)
	$(CC) $(ALL_LDFLAGS) -o $@ $(filter %.o,$^) $(LIB) $(CMOCKA_LIBS) $(ALL_LDLIBS)

# The fuzz harness is built only by `make fuzz` (clang); compiling it here as
# well (syntax only) keeps it in step with the library's headers.
$(BUILD)/fuzz_case.checked: fuzz/fuzz_case.c
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -MMD -MP -MT $@ -MF $(BUILD)/fuzz_case.d -fsyntax-only $<
	@touch $@

tests: $(TEST_BIN) $(BIN) $(BUILD)/fuzz_case.checked

# Every test binary runs even when one fails; the summary line counts them.
# tests/install-check.sh installs into a scratch DESTDIR (a sub-make: it
# inherits BUILD, SANITIZE... through MAKEFLAGS) and builds the C example
# with pkg-config; tests/python-tests.sh runs python/tests when it exists.
SCRIPT_TESTS = tests/golden.sh tests/install-check.sh $(if $(wildcard python/tests),tests/python-tests.sh)
check: tests $(SHLIB_DEV)
	@HF_BIN=$(abspath $(BIN)) HF_ROOT=$(CURDIR) HF_BUILD=$(BUILD) HF_CC='$(CC)' MAKE='$(MAKE)' \
	    HF_SANITIZE='$(SANITIZE)' PYTHON='$(PYTHON)' \
	    HF_EXAMPLE_CFLAGS='$(if $(SANITIZE),-fsanitize=$(SANITIZE) -fno-omit-frame-pointer)' \
	    sh scripts/run-tests.sh $(TEST_BIN) $(SCRIPT_TESTS)

demo: $(BIN)
	./$(BIN) run cases/barge.yaml --out barge-results
	@echo "open barge-results/report.html in a browser for the report"

debug:
	$(MAKE) BUILD=build-debug OPT='-O0 -g3' check

# The public headers are include/holdfast/*.h except cli.h (the program's).
PUBLIC_HEADERS = $(filter-out include/holdfast/cli.h,$(wildcard include/holdfast/*.h))
PY_FILES = $(shell find python/holdfast -name '*.py' 2>/dev/null | sort)

$(BUILD)/holdfast.pc: mk/holdfast.pc.in $(BUILD)/flags FORCE
	@sed -e 's|@PREFIX@|$(PREFIX)|g' -e 's|@LIBDIR@|$(LIBDIR)|g' \
	    -e 's|@INCLUDEDIR@|$(INCLUDEDIR)|g' -e 's|@VERSION@|$(VERSION)|g' \
	    -e 's|@OMP@|$(OMP)|g' $< >$@.tmp && mv $@.tmp $@

# Everything a user of the program, the C library or the Python package
# needs, under $(DESTDIR)$(PREFIX).  ldconfig runs only for a real install
# (no DESTDIR), as root; otherwise it says what to do.
install: $(BIN) $(SHLIB_DEV) $(LIB) $(BUILD)/holdfast.pc
	install -D -m 755 $(BIN) $(DESTDIR)$(BINDIR)/holdfast
	install -D -m 644 docs/holdfast.1 $(DESTDIR)$(MANDIR)/man1/holdfast.1
	install -D -m 755 $(SHLIB) $(DESTDIR)$(LIBDIR)/$(notdir $(SHLIB))
	ln -sf $(notdir $(SHLIB)) $(DESTDIR)$(LIBDIR)/$(notdir $(SHLIB_SONAME))
	ln -sf $(notdir $(SHLIB_SONAME)) $(DESTDIR)$(LIBDIR)/$(notdir $(SHLIB_DEV))
	install -D -m 644 $(LIB) $(DESTDIR)$(LIBDIR)/libholdfast.a
	install -d $(DESTDIR)$(INCLUDEDIR)/holdfast
	install -m 644 $(PUBLIC_HEADERS) $(DESTDIR)$(INCLUDEDIR)/holdfast/
	install -D -m 644 $(BUILD)/holdfast.pc $(DESTDIR)$(PKGCONFIGDIR)/holdfast.pc
	@set -e; for f in $(PY_FILES); do \
	    echo "install -D -m 644 $$f $(DESTDIR)$(PYTHON_SITE)/$${f#python/}"; \
	    install -D -m 644 "$$f" "$(DESTDIR)$(PYTHON_SITE)/$${f#python/}"; done
	@if [ -z "$(DESTDIR)" ] && [ "$$(id -u)" = 0 ]; then ldconfig; \
	elif [ -z "$(DESTDIR)" ]; then echo "install: run ldconfig as root, or set LD_LIBRARY_PATH=$(LIBDIR)"; fi

uninstall:
	rm -f $(DESTDIR)$(BINDIR)/holdfast $(DESTDIR)$(MANDIR)/man1/holdfast.1
	rm -f $(DESTDIR)$(LIBDIR)/$(notdir $(SHLIB)) $(DESTDIR)$(LIBDIR)/$(notdir $(SHLIB_SONAME)) \
	    $(DESTDIR)$(LIBDIR)/$(notdir $(SHLIB_DEV)) $(DESTDIR)$(LIBDIR)/libholdfast.a
	rm -f $(PUBLIC_HEADERS:include/holdfast/%=$(DESTDIR)$(INCLUDEDIR)/holdfast/%)
	rmdir $(DESTDIR)$(INCLUDEDIR)/holdfast 2>/dev/null || true
	rm -f $(DESTDIR)$(PKGCONFIGDIR)/holdfast.pc
	rm -rf $(DESTDIR)$(PYTHON_SITE)/holdfast

FORCE:

clean:
	rm -rf build build-* barge-results

help:
	@echo 'make [all]        build $(BIN), $(LIB) and $(SHLIB_DEV) (docs/library.md)'
	@echo 'make check        build and run every test (installs missing packages as root)'
	@echo 'make demo         run the barge demo case into barge-results/'
	@echo 'make debug        -O0 -g3 build and tests in build-debug/'
	@echo 'make install      program, libraries, headers, holdfast.pc, man page, Python package'
	@echo '                  into $$(DESTDIR)$$(PREFIX) (now $(DESTDIR)$(PREFIX))'
	@echo 'make uninstall    remove what install put there'
	@echo 'make lint         functions of src/*.c over 100 lines, library files using cli.h'
	@echo 'make format       reformat sources with .clang-format'
	@echo 'make format-check list files that differ from .clang-format (fails if any)'
	@echo 'make bench | sanitize | valgrind | fuzz   see mk/*.mk and docs/hardening.md'
	@echo 'Flags: OPT (default $(OPT)), CFLAGS, CPPFLAGS, LDFLAGS, LDLIBS are appended'
	@echo '       to the project flags; BUILD=dir builds elsewhere; WERROR= drops -Werror.'

# Further targets (bench, sanitize, fuzz, valgrind...) live in mk/*.mk.
-include $(wildcard mk/*.mk)
-include $(wildcard $(BUILD)/fuzz_case.d $(BUILD)/obj/*.d $(BUILD)/picobj/*.d $(BUILD)/tobj/*.d)
.SECONDARY:
