# mk/harden.mk - hardening targets: sanitizers, valgrind, fuzzing.
# What each target proves and how to read its output: docs/hardening.md.
# Every target builds in a directory of its own, never in $(BUILD).
#
#   make sanitize                 whole test suite under ASan + UBSan
#   make valgrind                 the CLI on every cases/*.yaml under memcheck
#   make fuzz [FUZZ_SECONDS=60]   libFuzzer on the case loader
#   make fuzz-regress             replay fuzz/regressions/* through the harness

ASAN_BUILD   ?= build-asan
VG_BUILD     ?= build-valgrind
FUZZ_BUILD   ?= build-fuzz
FUZZ_CC      ?= clang
FUZZ_SECONDS ?= 60
FUZZ_CORPUS  ?= fuzz-corpus
FUZZ_FLAGS   ?= -timeout=10 -rss_limit_mb=2048 -print_final_stats=1

# Exit 1 is holdfast's own "a criterion failed", so valgrind's errors get a
# status of their own.  Definite and indirect leaks are errors; memory the
# OpenMP runtime keeps for its thread pool is "still reachable" or "possibly
# lost" (thread stacks) and is not a leak of ours.
VG_EXIT  = 97
VALGRIND ?= valgrind
VG_FLAGS = --tool=memcheck --error-exitcode=$(VG_EXIT) --leak-check=full \
           --errors-for-leak-kinds=definite,indirect \
           --show-leak-kinds=definite,indirect --num-callers=30 --quiet

# Halt on the first report; leak checking on; an impossible allocation returns
# NULL as malloc does (tests ask for SIZE_MAX bytes on purpose).
HARDEN_ASAN_ENV = ASAN_OPTIONS=detect_leaks=1:abort_on_error=0:allocator_may_return_null=1:strict_string_checks=1:detect_stack_use_after_return=1 \
                  UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1

.PHONY: sanitize valgrind fuzz fuzz-build fuzz-regress

# gcc's ASan and libgomp get on: OpenMP stays on, so the thread-count tests
# run instrumented too.
sanitize:
	$(HARDEN_ASAN_ENV) $(MAKE) --no-print-directory BUILD=$(ASAN_BUILD) \
	    SANITIZE=address,undefined OPT='-O1 -g' check

valgrind:
	$(MAKE) --no-print-directory BUILD=$(VG_BUILD) OPT='-O1 -g' $(VG_BUILD)/holdfast
	@set -u; bin=$(abspath $(VG_BUILD))/holdfast; \
	tmp=$$(mktemp -d); trap 'rm -rf "$$tmp"' EXIT; \
	cases=$$(ls cases/*.yaml 2>/dev/null); \
	if [ -z "$$cases" ]; then echo "valgrind: no cases/*.yaml to run"; exit 1; fi; \
	runs=0; bad=0; \
	for c in $$cases; do \
	    name=$$(basename "$$c" .yaml); \
	    for cmd in check lines run; do \
	        if [ "$$cmd" = run ]; then extra="--out $$tmp/$$name-results"; else extra=""; fi; \
	        $(VALGRIND) $(VG_FLAGS) --log-file="$$tmp/vg.log" \
	            "$$bin" $$cmd "$$c" $$extra >"$$tmp/out" 2>"$$tmp/err"; rc=$$?; \
	        runs=$$((runs + 1)); \
	        if [ $$rc -eq $(VG_EXIT) ] || [ -s "$$tmp/vg.log" ]; then \
	            echo "valgrind: memcheck errors in: holdfast $$cmd $$c"; cat "$$tmp/vg.log"; \
	            bad=$$((bad + 1)); \
	        elif [ $$rc -gt 1 ]; then \
	            echo "valgrind: holdfast $$cmd $$c exited $$rc (a demo case must run):"; \
	            cat "$$tmp/err"; bad=$$((bad + 1)); \
	        else \
	            echo "valgrind: clean: holdfast $$cmd $$c (exit $$rc)"; \
	        fi; \
	    done; \
	done; \
	echo "valgrind: $$((runs - bad)) passed, $$bad failed"; \
	[ $$bad -eq 0 ]

# The library is built with clang and fuzzer-no-link instrumentation; the
# harness links libFuzzer's main.  Warnings are not fatal here: the normal
# build (gcc, -Werror) is the one that polices them.
fuzz-build:
	$(MAKE) --no-print-directory BUILD=$(FUZZ_BUILD) CC=$(FUZZ_CC) WERROR= OPT='-O1 -g' \
	    SANITIZE=fuzzer-no-link,address,undefined $(FUZZ_BUILD)/libholdfast.a
	$(FUZZ_CC) $(HF_CPPFLAGS) $(CPPFLAGS) -std=c11 -D_XOPEN_SOURCE=700 -O1 -g $(WARN) \
	    -fsanitize=fuzzer,address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer \
	    $(PKG_CFLAGS) fuzz/fuzz_case.c $(FUZZ_BUILD)/libholdfast.a -o $(FUZZ_BUILD)/fuzz_case \
	    $(PKG_LIBS) $(OMP) -lm

FUZZ_SEED_DIRS = $(wildcard fuzz/seeds cases tests/data tests/malformed fuzz/regressions)

# The first directory is the (git-ignored) working corpus; libFuzzer adds new
# inputs there and only reads the seed directories after it.
fuzz: fuzz-build fuzz-regress
	@mkdir -p $(FUZZ_CORPUS) $(FUZZ_BUILD)/artifacts
	$(HARDEN_ASAN_ENV) $(FUZZ_BUILD)/fuzz_case $(FUZZ_FLAGS) -max_total_time=$(FUZZ_SECONDS) \
	    -dict=fuzz/case.dict -artifact_prefix=$(FUZZ_BUILD)/artifacts/ \
	    $(FUZZ_CORPUS) $(FUZZ_SEED_DIRS)

# Every input that once crashed or hung the loader, run once each.
fuzz-regress: fuzz-build
	@set -e; n=0; for f in fuzz/regressions/*; do \
	    [ -f "$$f" ] && [ "$${f##*/}" != README ] || continue; n=$$((n + 1)); \
	    $(HARDEN_ASAN_ENV) $(FUZZ_BUILD)/fuzz_case -timeout=10 "$$f" >$(FUZZ_BUILD)/regress.log 2>&1 \
	        || { cat $(FUZZ_BUILD)/regress.log; echo "fuzz-regress: $$f fails"; exit 1; }; \
	done; echo "fuzz-regress: $$n regression inputs replayed, 0 failed"
