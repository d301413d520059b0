/* testutil.h - shared test helpers: outside checks that are asserted and
 * logged for docs/validation.md, and running the CLI in-process. */
#ifndef SR_TESTUTIL_H
#define SR_TESTUTIL_H

#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>

#include "sinkrate/files.h"

/* What a validation row is checked against (docs/validation.md counts them
 * by class). The first three are outside the project and must name their
 * source; SR_CHECK_MEMORY rows say "from memory", SR_CHECK_TRADE rows
 * "common practice" (scripts/validation.py fails the build otherwise). */
typedef enum sr_check_class {
    SR_CHECK_UNCLASSIFIED = 0, /* never used on purpose: the generator refuses a row without a class */
    SR_CHECK_PUBLISHED,   /* a value read in a published table, standard or dataset */
    SR_CHECK_LIBRARY,     /* a general-purpose reference library (udunits2, python3-fluids, scipy, ...) */
    SR_CHECK_METHOD,      /* an independent implementation of a published method, written in the test */
    SR_CHECK_DERIVED,     /* a derivation of this project (docs/method.md), computed again in the test */
    SR_CHECK_CONSISTENCY, /* two of the project's own computations agree */
    SR_CHECK_TRADE,       /* a fact of the trade ("common practice") */
    SR_CHECK_MEMORY,      /* a value recalled, not read ("from memory") */
    SR_CHECK_FORMAT       /* a file-format or structure check */
} sr_check_class;

/* The short name of a class as docs/validation.md prints it. */
const char *sr_test_class_name(sr_check_class c);

/* Assert |got - expected| <= rtol * |expected| and log the check with its
 * class and its source (a publication, a library, "from memory", "common
 * practice", or the section of docs/method.md for a derivation). */
#define CHECK_REL_CLASS(cls, quantity, source, expected, got, rtol) \
    sr_test_check(__FILE__, __LINE__, (cls), (quantity), (source), (expected), (got), (rtol), 0)
/* Same with an absolute tolerance. */
#define CHECK_ABS_CLASS(cls, quantity, source, expected, got, atol) \
    sr_test_check(__FILE__, __LINE__, (cls), (quantity), (source), (expected), (got), (atol), 1)

void sr_test_check(const char *file, int line, sr_check_class cls, const char *quantity, const char *source,
                   double expected, double got, double tol, int absolute);

/* Run the CLI in-process with a NULL-terminated argument list; returns the
 * exit code and fills *out / *err with malloc'd text (caller frees). */
int sr_test_cli(char **out, char **err, ...);
/* Same with an argv array. */
int sr_test_cli_argv(char **out, char **err, int argc, char **argv);

/* Path under the source tree (SR_ROOT), in a static buffer. */
const char *sr_test_path(const char *rel);

/* Write text to a fresh temporary file; returns its path (static buffer ring). */
const char *sr_test_tmpfile(const char *suffix, const char *text);

/* ---- the set-up tests share ---- */

/* The built-in catalog of the source tree (SR_ROOT/canopies), read on first
 * use and kept until the program exits; the test fails when it does not load. */
const sr_catalog *sr_test_catalog(void);
/* A mission read with that catalog: a file under the source tree ("payloads/
 * x.yaml"), or YAML text written to a temporary file. The test fails with the
 * reader's message when it does not load. Free it with sr_mission_free. */
sr_mission *sr_test_mission_file(const char *rel);
sr_mission *sr_test_mission_text(const char *yaml);
/* A new empty directory /tmp/sinkrate-<what>-XXXXXX, its name in buf (the
 * test fails when none can be made); sr_test_rmtree removes it with
 * everything in it. */
char *sr_test_tmpdir(char *buf, size_t len, const char *what);
void sr_test_rmtree(const char *dir);

/* Count newline-terminated lines of s. */
int sr_test_lines(const char *s);

/* The whole file as a NUL-terminated string (free it), its length in *len
 * (may be NULL); NULL when it cannot be read (at most 64 MiB). */
char *sr_test_slurp(const char *path, size_t *len);

/* Entries under dir, recursively (so a stray temporary or directory shows);
 * 0 when it cannot be opened. */
int sr_test_entries(const char *dir);

/* The source of figure checks: a PNG starts with its signature and the IHDR
 * chunk, which holds the width and height. */
#define SR_SRC_PNG "PNG specification (W3C REC / ISO/IEC 15948:2004) sec. 5.2 signature, 11.2.2 IHDR"
/* Width and height of a PNG file from its IHDR chunk; 0 when it is not a PNG. */
int sr_test_png_size(const char *path, unsigned *w, unsigned *h);

/* Run the CLI like sr_test_cli_argv with --plot among argv, gnuplot hidden
 * from PATH when hide; the test fails on a non-zero exit, on a missing note
 * that gnuplot is not there (hidden), or on a gnuplot warning (not hidden). */
void sr_test_cli_figure(char **out, char **err, int hide, int argc, char **argv);
/* The files of a figure written with --plot PREFIX: data and script with the
 * caution, the script loading the shared style, and the PNG of w x h pixels
 * when rendered (checked against the PNG specification, the check named by
 * what), or no PNG when not. */
void sr_test_check_figure(const char *prefix, int rendered, unsigned w, unsigned h, const char *what);

/* Whether the file at path contains text (0 when it cannot be read). */
int sr_test_file_has(const char *path, const char *text);
/* Data rows of the first block of a figure's .dat file whose title (its
 * header "# [N] title") starts with title; -1 when the file or the block is
 * missing. */
int sr_test_dat_rows(const char *path, const char *title);

#endif
