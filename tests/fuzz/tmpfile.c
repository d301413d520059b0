/* tmpfile.c - fuzz inputs as files, for the readers that take a file name. */
#define _DEFAULT_SOURCE
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "fuzz.h"

static char dir[64];

static void cleanup(void)
{
    DIR *d = opendir(dir);
    if (d) {
        struct dirent *e;
        while ((e = readdir(d)) != NULL)
            if (e->d_name[0] != '.') {
                char p[128];
                snprintf(p, sizeof p, "%s/%s", dir, e->d_name);
                unlink(p);
            }
        closedir(d);
    }
    rmdir(dir);
}

const char *fuzz_file(const char *name, const uint8_t *data, size_t size)
{
    static char path[128];
    if (!dir[0]) {
        snprintf(dir, sizeof dir, "%s/sinkrate-fuzz-XXXXXX", access("/dev/shm", W_OK) == 0 ? "/dev/shm" : "/tmp");
        if (!mkdtemp(dir))
            abort();
        atexit(cleanup);
    }
    snprintf(path, sizeof path, "%s/%s", dir, name);
    FILE *f = fopen(path, "wb");
    if (!f || fwrite(data, 1, size, f) != size || fclose(f) != 0)
        abort();
    return path;
}
