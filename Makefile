# holdfast - quasi-static mooring analysis.  Plain GNU make.
# Settings first; everything below them is mechanics.

PREFIX   ?= /usr/local
DESTDIR  ?=
CC       ?= cc
OPT      ?= -O2 -g
SANITIZE ?=
PKGS      = gsl yaml-0.1
VERSION   = 0.1.0

WARN  = -Wall
WARN += -Wextra
WARN += -Wpedantic
WARN += -Wshadow
WARN += -Wstrict-prototypes
WARN += -Wmissing-prototypes
WARN += -Wno-unused-parameter
WERROR ?= -Werror

BUILD ?= build

# Missing development packages are reported (or installed, as root) here,
# before any compiler error can hide the real cause.
DEPS_OK := $(shell sh scripts/ensure-deps.sh >&2 && echo yes)
ifneq ($(DEPS_OK),yes)
$(error missing packages: see the message above)
endif

PKG_CFLAGS := $(shell pkg-config --cflags $(PKGS))
PKG_LIBS   := $(shell pkg-config --libs $(PKGS))
CMOCKA_CFLAGS := $(shell pkg-config --cflags cmocka)
CMOCKA_LIBS   := $(shell pkg-config --libs cmocka)

OMP ?= -fopenmp
CPPFLAGS += -Iinclude -DHF_VERSION=\"$(VERSION)\"
CFLAGS   += -std=c11 -D_XOPEN_SOURCE=700 $(OPT) $(WARN) $(WERROR) $(OMP) $(PKG_CFLAGS)
ifneq ($(SANITIZE),)
CFLAGS  += -fsanitize=$(SANITIZE) -fno-omit-frame-pointer -fno-sanitize-recover=all
LDFLAGS += -fsanitize=$(SANITIZE)
endif
LDLIBS  += $(PKG_LIBS) $(OMP) -lm

LIB_SRC  := $(filter-out src/main.c,$(wildcard src/*.c))
LIB_OBJ  := $(LIB_SRC:src/%.c=$(BUILD)/obj/%.o)
TEST_SRC := $(wildcard tests/test_*.c)
TEST_BIN := $(TEST_SRC:tests/%.c=$(BUILD)/%)
TEST_SUPPORT := $(filter-out $(TEST_SRC),$(wildcard tests/*.c))
TEST_SUPPORT_OBJ := $(TEST_SUPPORT:tests/%.c=$(BUILD)/tobj/%.o)
LIB      := $(BUILD)/libholdfast.a
BIN      := $(BUILD)/holdfast

.PHONY: all check demo clean install uninstall debug tests
all: $(BIN)

$(BUILD)/obj/%.o: src/%.c
	@mkdir -p $(dir $@)
	$(CC) $(CPPFLAGS) $(CFLAGS) -MMD -MP -c $< -o $@

$(BUILD)/tobj/%.o: tests/%.c
	@mkdir -p $(dir $@)
	$(CC) $(CPPFLAGS) $(CFLAGS) $(CMOCKA_CFLAGS) -MMD -MP -c $< -o $@

$(LIB): $(LIB_OBJ)
	@rm -f $@
	$(AR) rcs $@ $^

$(BIN): $(BUILD)/obj/main.o $(LIB)
	$(CC) $(LDFLAGS) -o $@ $^ $(LDLIBS)

$(BUILD)/obj/main.o: src/main.c
	@mkdir -p $(dir $@)
	$(CC) $(CPPFLAGS) $(CFLAGS) -MMD -MP -c $< -o $@

$(BUILD)/test_%: $(BUILD)/tobj/test_%.o $(TEST_SUPPORT_OBJ) $(LIB)
	$(CC) $(LDFLAGS) -o $@ $^ $(CMOCKA_LIBS) $(LDLIBS)

tests: $(TEST_BIN) $(BIN)

# Every test binary runs even when one fails; the summary line counts them.
check: tests
	@HF_BIN=$(abspath $(BIN)) HF_ROOT=$(CURDIR) sh scripts/run-tests.sh $(TEST_BIN) tests/golden.sh

demo: $(BIN)
	./$(BIN) run cases/barge.yaml --out barge-results
	@echo "open barge-results/report.html in a browser for the report"

debug:
	$(MAKE) BUILD=build-debug OPT='-O0 -g3' check

install: $(BIN)
	install -D -m 755 $(BIN) $(DESTDIR)$(PREFIX)/bin/holdfast
	install -D -m 644 docs/holdfast.1 $(DESTDIR)$(PREFIX)/share/man/man1/holdfast.1

uninstall:
	rm -f $(DESTDIR)$(PREFIX)/bin/holdfast $(DESTDIR)$(PREFIX)/share/man/man1/holdfast.1

clean:
	rm -rf build build-* barge-results

# Further targets (bench, sanitize, fuzz, valgrind...) live in mk/*.mk.
-include $(wildcard mk/*.mk)
-include $(wildcard $(BUILD)/obj/*.d $(BUILD)/tobj/*.d)
.SECONDARY:
