/* fuzz.h - what every fuzz target defines: libFuzzer's two entry points.
 * The same files build as libFuzzer programs (make fuzz) and, with replay.c,
 * as plain programs that replay the corpus and regression inputs (make check). */
#ifndef SR_FUZZ_H
#define SR_FUZZ_H

#include <stddef.h>
#include <stdint.h>

#ifndef SR_SOURCE_ROOT
#define SR_SOURCE_ROOT "."
#endif

int LLVMFuzzerInitialize(int *argc, char ***argv);
int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* A broken invariant is a bug the fuzzer must report: abort with a reason. */
#define FUZZ_ASSERT(cond)                                                                                      \
    do {                                                                                                       \
        if (!(cond)) {                                                                                         \
            fprintf(stderr, "%s:%d: invariant failed: %s\n", __FILE__, __LINE__, #cond);                       \
            abort();                                                                                           \
        }                                                                                                      \
    } while (0)

/* Every error is one printable line, whatever bytes the input held. */
#define FUZZ_MSG_OK(msg)                                                                                       \
    do {                                                                                                       \
        FUZZ_ASSERT((msg)[0] != '\0');                                                                         \
        for (const char *p_ = (msg); *p_; p_++)                                                                \
            FUZZ_ASSERT((unsigned char)*p_ >= 0x20 && *p_ != 0x7f);                                            \
    } while (0)

/* Write the input to NAME in a private temporary directory (tmpfs when there
 * is one) and return its path, for readers that take a file name. The
 * directory goes when the process exits. */
const char *fuzz_file(const char *name, const uint8_t *data, size_t size);

#endif
