# Makefile - build, test, demo, bench and install sinkrate.
# `make deps`, `make check` and `make demo` install missing Debian packages first
# (scripts/deps.sh); a plain `make` never installs: it names the command to run.

PREFIX  ?= /usr/local
DESTDIR ?=
BINDIR   = $(PREFIX)/bin
LIBDIR   = $(PREFIX)/lib
INCLUDEDIR = $(PREFIX)/include
PKGCONFIGDIR = $(LIBDIR)/pkgconfig
DATADIR  = $(PREFIX)/share/sinkrate
MANDIR   = $(PREFIX)/share/man/man1
MAN3DIR  = $(PREFIX)/share/man/man3
DOCDIR   = $(PREFIX)/share/doc/sinkrate
BASHCOMPDIR = $(PREFIX)/share/bash-completion/completions

# The library's release (include/sinkrate/base.h) and its soname: the major
# number changes when the installed API (include/) changes incompatibly.
VERSION := $(shell sed -n 's/^\#define SR_VERSION_STRING "\(.*\)"/\1/p' include/sinkrate/base.h)
SOMAJOR := $(firstword $(subst ., ,$(VERSION)))
SONAME   = libsinkrate.so.$(SOMAJOR)

CC      ?= cc
CSTD     = -std=c11 -D_POSIX_C_SOURCE=200809L
WARN     = -Wall -Wextra -Werror -Wno-unused-parameter -Wno-format-truncation -Wno-unknown-warning-option
OPT     ?= -O2 -g
PKGS     = yaml-0.1 gsl jansson proj
# linked; proj only for its header: src/physics/geodesy.c opens libproj when a
# map needs it, since its dependencies cost about 20 ms at every start
LINK_PKGS = yaml-0.1 gsl jansson
# Deferred and cached on first use: pkg-config runs when the first recipe needs
# the flags, after the deps step, never when make reads this file (on a fresh
# machine the packages do not exist yet at that moment).
PKG_CFLAGS = $(eval PKG_CFLAGS := $$(shell pkg-config --cflags $(PKGS) 2>/dev/null))$(PKG_CFLAGS)
PKG_LIBS   = $(eval PKG_LIBS := $$(shell pkg-config --libs $(LINK_PKGS) 2>/dev/null))$(PKG_LIBS)
PROJ_SONAME = $(eval PROJ_SONAME := $$(shell objdump -p "$$$$(pkg-config --variable=libdir proj 2>/dev/null)/libproj.so" \
                2>/dev/null | awk '/SONAME/ {print $$$$2}'))$(PROJ_SONAME)
TEST_LIBS  = $(eval TEST_LIBS := $$(shell pkg-config --libs cmocka udunits 2>/dev/null))$(TEST_LIBS)
OMP      = -fopenmp
# Position-independent for the shared library; every name hidden unless its
# declaration in include/ carries SR_API (tests/symbols.py checks the export).
PIC      = -fPIC -fvisibility=hidden
CFLAGS_ALL = $(CSTD) $(WARN) $(OPT) $(OMP) $(PIC) $(PKG_CFLAGS) -Iinclude -Isrc -DSR_DATADIR='"$(DATADIR)"' \
             $(if $(PROJ_SONAME),-DSR_PROJ_SONAME='"$(PROJ_SONAME)"') $(CFLAGS)
LDLIBS_ALL = $(PKG_LIBS) -lcsv -lm -ldl $(OMP) $(LDFLAGS)

B        ?= build
# the library's layers, bottom up (DEVELOPERS.md): base, physics, files, analysis, output
LAYERS   := base physics files analysis output
LIB_SRC  := $(sort $(foreach d,$(LAYERS),$(wildcard src/$(d)/*.c)))
CLI_SRC  := $(sort $(wildcard src/cli/*.c))
LIB_OBJ  := $(LIB_SRC:src/%.c=$(B)/obj/%.o)
CLI_OBJ  := $(CLI_SRC:src/cli/%.c=$(B)/obj/cli/%.o)
CLI_LIBOBJ := $(filter-out $(B)/obj/cli/main.o,$(CLI_OBJ))
TEST_SRC := $(sort $(wildcard tests/test_*.c))
# The reference-library scripts (tests/ref/ref_*.py) run under Debian's python3,
# whose packages scripts/deps.sh installs (python3-fluids, -scipy, -statsmodels).
PYTHON  ?= $(firstword $(wildcard /usr/bin/python3) python3)
REFS     := $(sort $(wildcard tests/ref/ref_*.py))
TESTS    := $(TEST_SRC:tests/%.c=$(B)/tests/%)
DEPS_OK  := $(B)/.deps-ok

.SECONDARY:
.PHONY: all deps check unit reference figures readme readme-check demo bench install uninstall install-check symbols \
        layers clean plots validation validation-selftest \
        validation-doc sanitize valgrind fuzz fuzz-build fuzz-regress
all: $(B)/sinkrate

# `make deps` installs everything the build and the tests need; the stamp a
# plain build depends on only checks the build packages and never installs.
deps:
	@sh scripts/deps.sh install
	@mkdir -p $(B) && touch $(DEPS_OK)
$(DEPS_OK): scripts/deps.sh
	@sh scripts/deps.sh build
	@mkdir -p $(B) && touch $@

$(B)/obj/%.o: src/%.c | $(DEPS_OK)
	@mkdir -p $(dir $@)
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) -MMD -MP -c $< -o $@

$(B)/libsinkrate.a: $(LIB_OBJ)
	@rm -f $@
	@ar rcs $@ $^

# The shared library: the same objects, only the API exported, with its soname.
$(B)/libsinkrate.so.$(VERSION): $(LIB_OBJ)
	@echo "  LD $@"; $(CC) -shared -Wl,-soname,$(SONAME) -Wl,--no-undefined -o $@ $^ $(LDLIBS_ALL)
$(B)/libsinkrate.so: $(B)/libsinkrate.so.$(VERSION)
	@ln -sf libsinkrate.so.$(VERSION) $(B)/$(SONAME) && ln -sf $(SONAME) $@

# The pkg-config file of an installed tree.
$(B)/sinkrate.pc: sinkrate.pc.in include/sinkrate/base.h
	@mkdir -p $(B)
	@sed -e 's|@PREFIX@|$(PREFIX)|' -e 's|@LIBDIR@|$(LIBDIR)|' -e 's|@INCLUDEDIR@|$(INCLUDEDIR)|' \
	  -e 's|@VERSION@|$(VERSION)|' -e 's|@PKGS@|$(LINK_PKGS)|' $< > $@

$(B)/libsinkrate-cli.a: $(CLI_LIBOBJ)
	@rm -f $@
	@ar rcs $@ $^

$(B)/sinkrate: $(B)/obj/cli/main.o $(B)/libsinkrate-cli.a $(B)/libsinkrate.a
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) -o $@ $^ $(LDLIBS_ALL)

$(B)/obj/tests/%.o: tests/%.c | $(DEPS_OK)
	@mkdir -p $(dir $@)
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) -Itests -MMD -MP -c $< -o $@

$(B)/tests/test_%: $(B)/obj/tests/test_%.o $(B)/obj/tests/testutil.o $(B)/libsinkrate-cli.a $(B)/libsinkrate.a
	@mkdir -p $(dir $@)
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) -o $@ $^ $(TEST_LIBS) $(LDLIBS_ALL)

# Unit and CLI tests; each test binary appends its outside checks to the
# validation log, from which docs/validation.md is written.
unit: $(TESTS) $(B)/sinkrate
	@rm -f $(B)/validation.tsv
	@fail=0; for t in $(TESTS); do \
	  SINKRATE_DATA=$(CURDIR) SR_VALIDATION_LOG=$(CURDIR)/$(B)/validation.tsv SR_ROOT=$(CURDIR) \
	    CMOCKA_MESSAGE_OUTPUT=stdout $$t || fail=1; \
	done; exit $$fail

# The built sinkrate against the reference libraries: each script appends its
# rows to the same validation log (run after `unit`, which starts the log).
reference: $(B)/sinkrate
	@fail=0; for r in $(REFS); do \
	  PYTHONPATH=$(CURDIR)/tests/ref PYTHONDONTWRITEBYTECODE=1 SINKRATE_DATA=$(CURDIR) \
	    SR_VALIDATION_LOG=$(CURDIR)/$(B)/validation.tsv $(PYTHON) $$r $(CURDIR)/$(B)/sinkrate || fail=1; \
	done; exit $$fail

# Every README figure drawn again and checked from its .dat and .gp: no
# legend or label box over data, no marker line on the frame, every legend
# entry visible, no SI unit on a figure under --units us (tests/figures.py).
figures: $(B)/sinkrate
	@PYTHONDONTWRITEBYTECODE=1 SINKRATE_DATA=$(CURDIR) $(PYTHON) tests/figures.py $(B)/sinkrate

# The README's console examples run for real and compared with its text
# (scripts/readme_examples.py); `make readme` writes the real outputs into
# README.md after an output changed (review git diff README.md).
readme-check: $(B)/sinkrate
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) scripts/readme_examples.py $(B)/sinkrate
readme: $(B)/sinkrate
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) scripts/readme_examples.py $(B)/sinkrate --update

# The generator of docs/validation.md refuses crafted bad logs (its self-test).
validation-selftest:
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) tests/ref/selftest_validation.py $(PYTHON) scripts/validation.py

# docs/validation.md from the log: fails on a row without a class, an outside
# row without a source, a failed row, or a header that disagrees with its rows.
VALIDATION_ARGS = $(B)/validation.tsv --sinkrate $(B)/sinkrate --data $(CURDIR) --legend README.md \
                  --legend docs/method.md
validation-doc: $(B)/sinkrate
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) scripts/validation.py $(VALIDATION_ARGS) > docs/validation.md.tmp \
	  || { rm -f docs/validation.md.tmp; exit 1; }
	@mv docs/validation.md.tmp docs/validation.md
	@$(PYTHON) scripts/validation.py --verify docs/validation.md
	@sed -n 's/^\*\*\(.*\)\*\*$$/docs\/validation.md: \1/p' docs/validation.md | head -1

# check = the Makefile's own order (pkg-config read only after the deps step,
# scripts/makefile-order.sh), the suite, the layers of the source tree, the
# exported symbols, a staged install with the examples built against it, the
# reference libraries, the README's figures and console examples, the suite and
# fuzz regressions under ASan+UBSan, the CLI examples under valgrind, then
# docs/validation.md.
# The deps step runs in its own make first, so the build after it reads the
# pkg-config flags of packages it may just have installed.
check:
	@sh scripts/makefile-order.sh
	@$(MAKE) --no-print-directory deps
	@$(MAKE) --no-print-directory unit
	@$(MAKE) --no-print-directory layers symbols install-check
	@$(MAKE) --no-print-directory reference
	@$(MAKE) --no-print-directory figures readme-check
	@$(MAKE) --no-print-directory sanitize valgrind validation-selftest
	@$(MAKE) --no-print-directory validation-doc

validation: check

# ---- hardening: sanitizers, valgrind, fuzzing (tests/fuzz/README.md) ----
SAN_OPT      = -O1 -g -fsanitize=address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer
FUZZ_OPT     = $(SAN_OPT) -fsanitize=fuzzer-no-link -Wno-unknown-warning-option
FUZZ_SECONDS ?= 60
FUZZ_NAMES  := $(sort $(patsubst tests/fuzz/fuzz_%.c,%,$(wildcard tests/fuzz/fuzz_*.c)))
FUZZ_FLAGS   = -Itests/fuzz -DSR_SOURCE_ROOT='"$(CURDIR)"'
# the command-line target must never write files: its stub replaces the writer
FUZZ_WRAP_cli = -Wl,--wrap=sr_txn_reserve -Wl,--wrap=sr_txn_write -Wl,--wrap=sr_txn_commit

# Each fuzz target as a plain program replaying its seed corpus and the
# regression inputs (crashes the fuzzer once found) ...
$(B)/fuzz/replay_%: tests/fuzz/fuzz_%.c tests/fuzz/replay.c tests/fuzz/tmpfile.c tests/fuzz/fuzz.h $(B)/libsinkrate-cli.a \
                    $(B)/libsinkrate.a
	@mkdir -p $(dir $@)
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) $(FUZZ_FLAGS) $(FUZZ_WRAP_$*) -o $@ $(filter %.c %.a,$^) $(LDLIBS_ALL)
# ... and as a libFuzzer program (built by `make fuzz` with clang).
$(B)/fuzz/fuzz_%: tests/fuzz/fuzz_%.c tests/fuzz/tmpfile.c tests/fuzz/fuzz.h $(B)/libsinkrate-cli.a $(B)/libsinkrate.a
	@mkdir -p $(dir $@)
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) $(FUZZ_FLAGS) $(FUZZ_WRAP_$*) -fsanitize=fuzzer -o $@ $(filter %.c %.a,$^) \
	  $(LDLIBS_ALL)

fuzz-regress: $(FUZZ_NAMES:%=$(B)/fuzz/replay_%)
	@for n in $(FUZZ_NAMES); do $(B)/fuzz/replay_$$n tests/fuzz/corpus/$$n tests/fuzz/regress/$$n || exit 1; done

# The unit and CLI suite and the fuzz regressions under ASan+UBSan, in
# build-asan; without sanitizers (and saying so) where the compiler lacks them.
sanitize: | $(DEPS_OK)
	@if echo 'int main(void){return 0;}' | $(CC) -x c -fsanitize=address,undefined -o $(B)/.san-probe - 2>/dev/null; then \
	  $(MAKE) --no-print-directory B=build-asan OPT="$(SAN_OPT)" unit fuzz-regress; \
	else \
	  echo "sanitize: $(CC) has no ASan/UBSan here; fuzz regressions run without them"; \
	  $(MAKE) --no-print-directory fuzz-regress; \
	fi; rc=$$?; rm -f $(B)/.san-probe; exit $$rc

# The CLI examples under valgrind: no memory errors, no definite or indirect leaks.
valgrind: $(B)/sinkrate
	@sh scripts/valgrind.sh $(B)/sinkrate

# libFuzzer: build every target with clang, then run each FUZZ_SECONDS.
fuzz-build:
	@$(MAKE) --no-print-directory B=build-fuzz CC=clang OPT="$(FUZZ_OPT)" $(FUZZ_NAMES:%=build-fuzz/fuzz/fuzz_%)

fuzz: fuzz-build
	@sh scripts/fuzz.sh build-fuzz $(FUZZ_SECONDS) $(FUZZ_NAMES)

demo:
	@$(MAKE) --no-print-directory deps
	@$(MAKE) --no-print-directory $(B)/sinkrate
	@sh scripts/demo.sh $(B)/sinkrate

# The README's figures from the demo scenario (needs gnuplot): plots/*.png
plots: $(B)/sinkrate
	@SINKRATE_DATA=$(CURDIR) sh scripts/plots.sh $(B)/sinkrate

$(B)/bench: bench/bench.c $(B)/libsinkrate-cli.a $(B)/libsinkrate.a
	@echo "  CC $@"; $(CC) $(CFLAGS_ALL) -o $@ $^ $(LDLIBS_ALL)

bench: $(B)/bench $(B)/sinkrate
	@SINKRATE_DATA=$(CURDIR) $(B)/bench $(B)/sinkrate

# The bash completion, written by the program from its own command and option tables.
$(B)/sinkrate.bash: $(B)/sinkrate
	@$(B)/sinkrate --completion bash > $@.tmp && mv $@.tmp $@

LIB_FILES = $(B)/libsinkrate.so.$(VERSION) $(B)/libsinkrate.a $(B)/sinkrate.pc

install: $(B)/sinkrate $(B)/sinkrate.bash $(LIB_FILES)
	install -d $(DESTDIR)$(BINDIR) $(DESTDIR)$(DATADIR)/canopies $(DESTDIR)$(DATADIR)/plots $(DESTDIR)$(MANDIR) \
	  $(DESTDIR)$(MAN3DIR) $(DESTDIR)$(DOCDIR) $(DESTDIR)$(BASHCOMPDIR) $(DESTDIR)$(LIBDIR) \
	  $(DESTDIR)$(PKGCONFIGDIR) $(DESTDIR)$(INCLUDEDIR)/sinkrate
	install -m 755 $(B)/sinkrate $(DESTDIR)$(BINDIR)/sinkrate
	install -m 644 canopies/*.yaml $(DESTDIR)$(DATADIR)/canopies/
	install -m 644 plots/*.gp $(DESTDIR)$(DATADIR)/plots/ 2>/dev/null || true
	install -m 644 docs/sinkrate.1 $(DESTDIR)$(MANDIR)/sinkrate.1
	install -m 644 docs/libsinkrate.3 $(DESTDIR)$(MAN3DIR)/libsinkrate.3
	install -m 644 docs/files.md $(DESTDIR)$(DOCDIR)/files.md
	install -m 644 $(B)/sinkrate.bash $(DESTDIR)$(BASHCOMPDIR)/sinkrate
	install -m 755 $(B)/libsinkrate.so.$(VERSION) $(DESTDIR)$(LIBDIR)/libsinkrate.so.$(VERSION)
	ln -sf libsinkrate.so.$(VERSION) $(DESTDIR)$(LIBDIR)/$(SONAME)
	ln -sf $(SONAME) $(DESTDIR)$(LIBDIR)/libsinkrate.so
	install -m 644 $(B)/libsinkrate.a $(DESTDIR)$(LIBDIR)/libsinkrate.a
	install -m 644 $(B)/sinkrate.pc $(DESTDIR)$(PKGCONFIGDIR)/sinkrate.pc
	install -m 644 include/sinkrate.h $(DESTDIR)$(INCLUDEDIR)/sinkrate.h
	install -m 644 include/sinkrate/*.h $(DESTDIR)$(INCLUDEDIR)/sinkrate/

uninstall:
	rm -f $(DESTDIR)$(BINDIR)/sinkrate $(DESTDIR)$(MANDIR)/sinkrate.1 $(DESTDIR)$(MAN3DIR)/libsinkrate.3 \
	  $(DESTDIR)$(BASHCOMPDIR)/sinkrate
	rm -f $(DESTDIR)$(LIBDIR)/libsinkrate.so.$(VERSION) $(DESTDIR)$(LIBDIR)/$(SONAME) \
	  $(DESTDIR)$(LIBDIR)/libsinkrate.so $(DESTDIR)$(LIBDIR)/libsinkrate.a $(DESTDIR)$(PKGCONFIGDIR)/sinkrate.pc
	rm -f $(DESTDIR)$(INCLUDEDIR)/sinkrate.h
	rm -rf $(DESTDIR)$(INCLUDEDIR)/sinkrate $(DESTDIR)$(DATADIR) $(DESTDIR)$(DOCDIR)

# The library from outside (tests/install.py): a staged `make install` into a
# temporary DESTDIR, the examples built with `pkg-config --cflags --libs
# sinkrate` against it and run, the same statically, then `make uninstall`
# leaves nothing behind. The shared library exports only the API, every name
# sr_ (tests/symbols.py), and the source tree keeps its layers
# (tests/layers.py).
install-check: $(B)/sinkrate $(B)/sinkrate.bash $(LIB_FILES)
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) tests/install.py "$(MAKE)" $(B)

symbols: $(B)/libsinkrate.so $(B)/libsinkrate.a $(CLI_OBJ)
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) tests/symbols.py $(B)

layers: $(LIB_OBJ) $(CLI_OBJ)
	@PYTHONDONTWRITEBYTECODE=1 $(PYTHON) tests/layers.py $(B)

clean:
	rm -rf $(B) build-*

-include $(LIB_OBJ:.o=.d) $(CLI_OBJ:.o=.d) $(TEST_SRC:tests/%.c=$(B)/obj/tests/%.d)
