# mk/bench.mk - `make bench`: optimised build in a directory of its own, then
# the benchmark program (bench/*.c) prints every figure; docs/performance.md
# explains them.  Nothing here is asserted: targets are printed, met or not.
#
#   make bench                   full run (about half a minute on 2 cores)
#   make bench BENCH_ARGS=--quick
#   make bench-build             only build $(BENCH_BUILD)/holdfast and the benchmark
#
# -O2 only: -march=native would make the figures depend on the build host and
# the binary unportable (CI); -g costs nothing at run time and lets a profiler
# name the functions.

BENCH_BUILD ?= build-bench
BENCH_OPT   ?= -O2 -g
BENCH_ARGS  ?=
BENCH_SRC    = $(wildcard bench/*.c)

.PHONY: bench bench-build

bench-build:
	$(MAKE) --no-print-directory BUILD=$(BENCH_BUILD) OPT='$(BENCH_OPT)' \
	    $(BENCH_BUILD)/holdfast $(BENCH_BUILD)/holdfast-bench

bench: bench-build
	@mkdir -p $(BENCH_BUILD)/bench-out
	$(BENCH_BUILD)/holdfast-bench --holdfast $(abspath $(BENCH_BUILD))/holdfast \
	    --root $(CURDIR) --out $(abspath $(BENCH_BUILD))/bench-out $(BENCH_ARGS)

# Built in whatever $(BUILD) the sub-make was given (the bench directory).
$(BUILD)/bobj/%.o: bench/%.c $(BUILD)/flags
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -DHF_BENCH_OPT='"$(OPT)"' -MMD -MP -c $< -o $@

$(BUILD)/holdfast-bench: $(BENCH_SRC:bench/%.c=$(BUILD)/bobj/%.o) $(LIB)
	$(CC) $(ALL_LDFLAGS) -o $@ $^ $(ALL_LDLIBS)

-include $(wildcard $(BUILD)/bobj/*.d)
