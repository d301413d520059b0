/* replay.c - main() for the fuzz targets built as plain programs: feed every
 * file named on the command line (directories: every file in them, sorted)
 * to LLVMFuzzerTestOneInput once. `make check` runs the seed corpus and the
 * regression inputs (crashes the fuzzer once found) this way. */
#define _DEFAULT_SOURCE
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "fuzz.h"

static int run_file(const char *path)
{
    FILE *f = fopen(path, "rb");
    if (!f) {
        fprintf(stderr, "replay: cannot open %s\n", path);
        return 1;
    }
    size_t cap = 4096, len = 0;
    unsigned char *buf = malloc(cap);
    for (;;) {
        if (!buf)
            break;
        size_t got = fread(buf + len, 1, cap - len, f);
        len += got;
        if (len < cap)
            break;
        unsigned char *nb = realloc(buf, cap *= 2);
        if (!nb) {
            free(buf);
            buf = NULL;
        } else {
            buf = nb;
        }
    }
    fclose(f);
    if (!buf) {
        fprintf(stderr, "replay: out of memory reading %s\n", path);
        return 1;
    }
    /* an exact-size copy, so ASan sees reads past the end as libFuzzer would */
    unsigned char *exact = malloc(len ? len : 1);
    if (!exact) {
        free(buf);
        return 1;
    }
    memcpy(exact, buf, len);
    free(buf);
    LLVMFuzzerTestOneInput(exact, len);
    free(exact);
    return 0;
}

static int cmp(const void *a, const void *b)
{
    return strcmp(*(char *const *)a, *(char *const *)b);
}

int main(int argc, char **argv)
{
    /* absolute names first: a target may change directory when it starts */
    char **paths = calloc((size_t)argc + 1, sizeof *paths);
    if (!paths)
        return 1;
    for (int i = 1; i < argc; i++)
        paths[i] = realpath(argv[i], NULL); /* NULL: an empty regress/ may not exist in a fresh clone */
    LLVMFuzzerInitialize(&argc, &argv);
    int bad = 0;
    size_t count = 0;
    for (int i = 1; i < argc; i++) {
        struct stat st;
        if (!paths[i] || stat(paths[i], &st) != 0)
            continue;
        if (!S_ISDIR(st.st_mode)) {
            bad |= run_file(paths[i]);
            count++;
            continue;
        }
        DIR *d = opendir(paths[i]);
        if (!d)
            continue;
        char **names = NULL;
        size_t n = 0, cap = 0;
        struct dirent *e;
        while ((e = readdir(d)) != NULL) {
            if (e->d_name[0] == '.')
                continue;
            if (n == cap) {
                cap = cap ? cap * 2 : 64;
                char **nn = realloc(names, cap * sizeof *nn);
                if (!nn)
                    break;
                names = nn;
            }
            names[n++] = strdup(e->d_name);
        }
        closedir(d);
        if (n > 1) /* qsort must not see a NULL array, even empty */
            qsort(names, n, sizeof *names, cmp);
        for (size_t k = 0; k < n; k++) {
            char path[4096];
            snprintf(path, sizeof path, "%s/%s", paths[i], names[k]);
            bad |= run_file(path);
            count++;
            free(names[k]);
        }
        free(names);
    }
    for (int i = 1; i < argc; i++)
        free(paths[i]);
    free(paths);
    fprintf(stderr, "%s: %zu input(s) replayed\n", argv[0], count);
    return bad;
}
