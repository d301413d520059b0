/* yamldoc.h - strict access to a YAML document loaded with libyaml: every
 * key checked against a schema (unknown keys get a "did you mean"), no
 * duplicates, typed scalars, quantities that must carry units, and every
 * error at file:line:column (1-based). Loading bounds the file's size, its
 * nesting and its nodes (an alias counts at every use, and its nodes carry
 * the position of the use); a NUL character in a text or key is refused. */
#ifndef SR_YAMLDOC_H
#define SR_YAMLDOC_H

#include <stddef.h>
#include <yaml.h>

#include "base/error.h"
#include "physics/units.h"

#define SR_YAML_MAX_BYTES (1u << 20)   /* 1 MiB: far above any canopy or mission file */
#define SR_YAML_MAX_NODES 20000
#define SR_YAML_MAX_DEPTH 16
#define SR_YAML_MAX_ANCHORS 1000

/* Every problem of a file at once (`sinkrate check`): a list attached to the
 * reader keeps each positioned error, and the readers go on after one where
 * the structure allows (the next key, list item or block), as a compiler
 * does. Without a list a reader stops at the first problem. */
#define SR_YAML_MAX_ERRORS 64
typedef struct sr_yaml_errors {
    char msg[SR_YAML_MAX_ERRORS][SR_ERROR_MSG_MAX];
    int line[SR_YAML_MAX_ERRORS], column[SR_YAML_MAX_ERRORS]; /* each one's place in this file (0: none) */
    size_t n;      /* kept */
    size_t more;   /* beyond SR_YAML_MAX_ERRORS, counted only */
} sr_yaml_errors;

typedef struct sr_yaml {
    yaml_document_t doc;
    int loaded;
    char name[512];          /* file name for messages */
    sr_yaml_errors *errors;  /* NULL: stop at the first problem */
} sr_yaml;

int sr_yaml_load_file(sr_yaml *y, const char *path, sr_error *err);
/* The same with a list for every problem (it stays attached for the readers). */
int sr_yaml_load_file_all(sr_yaml *y, const char *path, sr_yaml_errors *list, sr_error *err);

/* Keep err's message in the reader's list (once). */
void sr_yaml_keep(const sr_yaml *y, const sr_error *err);

/* After a step of a reader that returned rc: 1 to go on with the next part
 * (rc was 0, or the reader keeps every problem and this one is kept, *acc
 * then remembers it), 0 to stop and return rc (no list, or out of memory). */
int sr_yaml_go_on(const sr_yaml *y, const sr_error *err, int rc, int *acc);

/* One step of a reader that has `sr_yaml *y`, `sr_error *err` and `int acc`
 * (its result so far): a problem is kept and the reader goes on, or, with
 * no list, the reader returns it. Steps that need an earlier one to have
 * succeeded test that themselves. */
#define SR_YAML_STEP(call)                                                                                    \
    do {                                                                                                      \
        int rc_ = (call);                                                                                     \
        if (rc_ && !sr_yaml_go_on(y, err, rc_, &acc))                                                         \
            return rc_;                                                                                       \
    } while (0)
int sr_yaml_load_string(sr_yaml *y, const char *name, const char *buf, size_t len, sr_error *err);
void sr_yaml_free(sr_yaml *y);

yaml_node_t *sr_yaml_root(sr_yaml *y);

/* Set err to "file:line:col: message" for node n. Returns SR_EINVAL. */
int sr_yaml_fail(const sr_yaml *y, const yaml_node_t *n, sr_error *err, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 4, 5)))
#endif
    ;

/* Check that n is a mapping whose keys are all in `allowed` (NULL-terminated),
 * that none repeats and that every key in `required` is present. `what`
 * names the block in messages ("site", "canopy family"). */
int sr_yaml_check_map(const sr_yaml *y, yaml_node_t *n, const char *what, const char *const *allowed,
                      const char *const *required, sr_error *err);

/* Value node of key in mapping n, or NULL. */
yaml_node_t *sr_yaml_get(const sr_yaml *y, yaml_node_t *n, const char *key);
/* Key node of key in mapping n (for positions), or NULL. */
yaml_node_t *sr_yaml_key_node(const sr_yaml *y, yaml_node_t *n, const char *key);

/* Typed scalars. Each fails with a positioned message when n is not a scalar
 * of the right form. A string (a name, an id, a file name, a word) holds no
 * control character at all (C0, DEL, C1): names reach reports and terminals. */
int sr_yaml_string(const sr_yaml *y, yaml_node_t *n, char *buf, size_t len, sr_error *err);
/* Free text (notes, sources): line breaks and tabs of a block scalar read as
 * spaces; any other control character is refused as in sr_yaml_string. */
int sr_yaml_text(const sr_yaml *y, yaml_node_t *n, char *buf, size_t len, sr_error *err);
int sr_yaml_number(const sr_yaml *y, yaml_node_t *n, double *v, sr_error *err);
int sr_yaml_int(const sr_yaml *y, yaml_node_t *n, long lo, long hi, long *v, sr_error *err);
/* true or false (YAML 1.2 core schema spellings only). */
int sr_yaml_bool(const sr_yaml *y, yaml_node_t *n, int *v, sr_error *err);
/* A quantity with a required unit ("1.2 kg"). */
int sr_yaml_quantity(const sr_yaml *y, yaml_node_t *n, sr_quantity q, double *si, sr_error *err);

/* Sequence helpers. */
size_t sr_yaml_seq_len(const yaml_node_t *n);
yaml_node_t *sr_yaml_seq_at(const sr_yaml *y, yaml_node_t *n, size_t i);
int sr_yaml_require_seq(const sr_yaml *y, yaml_node_t *n, const char *what, size_t min, size_t max, sr_error *err);

/* Closest word to `word` among candidates (NULL-terminated) within a small
 * edit distance, or NULL. */
const char *sr_yaml_suggest(const char *word, const char *const *candidates);

/* A file name given inside the document at doc_path, taken relative to that
 * document's directory (an absolute name stays as it is). */
void sr_yaml_relative_path(char *out, size_t len, const char *doc_path, const char *file);

#endif
