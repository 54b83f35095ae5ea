# mk/format.mk - source checks that build nothing (no packages needed):
#
#   make lint           functions of src/*.c over 100 lines (scripts/function-lengths.sh),
#                       and library sources that include the command layer's header
#   make format         rewrite every C source and header with .clang-format
#   make format-check   list the files clang-format would change, fail if any
#
# The files are the C sources and headers of src/, include/, tests/, bench/
# and fuzz/, and the C examples (examples/c/).  CLANG_FORMAT names the program (default clang-format).

CLANG_FORMAT ?= clang-format
FORMAT_FILES  = $(sort $(wildcard src/*.c src/*.h include/holdfast/*.h tests/*.c tests/*.h \
                                  bench/*.c bench/*.h fuzz/*.c fuzz/*.h examples/c/*.c))

.PHONY: lint format format-check

# The library (LIB_SRC, see the Makefile) must not use the program: no
# library source includes holdfast/cli.h.  Both checks run; either fails it.
lint:
	@rc=0; sh scripts/function-lengths.sh || rc=1; \
	up=$$(grep -l '^#include "holdfast/cli.h"' $(LIB_SRC)); \
	for f in $$up; do echo "layers: $$f (library) includes holdfast/cli.h (program)"; done; \
	echo "layers: $$(echo $$up | wc -w) library sources include the command layer's header"; \
	[ -z "$$up" ] || rc=1; exit $$rc

format:
	@command -v $(CLANG_FORMAT) >/dev/null || { echo "format: $(CLANG_FORMAT) not found (apt-get install clang-format)"; exit 2; }
	$(CLANG_FORMAT) -i --style=file $(FORMAT_FILES)

# One line per file that differs, with the number of lines clang-format would
# remove or add, then a count; exit 1 if any differs.
format-check:
	@command -v $(CLANG_FORMAT) >/dev/null || { echo "format-check: $(CLANG_FORMAT) not found (apt-get install clang-format)"; exit 2; }
	@set -u; bad=0; total=0; tmp=$$(mktemp); trap 'rm -f "$$tmp"' EXIT; \
	for f in $(FORMAT_FILES); do \
	    total=$$((total + 1)); \
	    if ! $(CLANG_FORMAT) --style=file "$$f" >"$$tmp"; then \
	        echo "format-check: $$f: clang-format failed"; bad=$$((bad + 1)); continue; fi; \
	    n=$$(diff "$$f" "$$tmp" | grep -c '^[<>]'); \
	    if [ "$$n" -gt 0 ]; then echo "format-check: $$f: $$n lines differ"; bad=$$((bad + 1)); fi; \
	done; \
	echo "format-check: $$bad of $$total files differ from .clang-format (make format fixes them)"; \
	[ $$bad -eq 0 ]
