/* bench.c - `make bench`: speed figures as ratios measured in one run.
 * Not a test: it prints, it never fails on a number. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#include "atmos.h"

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* keeps the optimiser from dropping the loops */
static volatile double sink;

/* Cost per call of f over n altitudes spread across the model, best of 5 runs. */
static double per_call_exp(size_t n)
{
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++)
            s += exp(-1e-4 * (double)(i % 86000));
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

static double per_call_atmos(const sr_atmos *m, size_t n, int density_only)
{
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++) {
            double z = (double)(i % 86000);
            if (density_only) {
                double rho;
                sr_atmos_density(m, z, &rho, NULL);
                s += rho;
            } else {
                sr_air a;
                sr_atmos_at(m, z, &a, NULL);
                s += a.rho;
            }
        }
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

static double process_time(const char *bin, char *const argv[], int reps)
{
    double best = 1e9;
    for (int r = 0; r < reps; r++) {
        double t0 = now();
        pid_t p = fork();
        if (p == 0) {
            if (!freopen("/dev/null", "w", stdout))
                _exit(127);
            execv(bin, argv);
            _exit(127);
        }
        int st;
        waitpid(p, &st, 0);
        double t = now() - t0;
        if (t < best)
            best = t;
    }
    return best;
}

int main(int argc, char **argv)
{
    const char *bin = argc > 1 ? argv[1] : "build/sinkrate";
    printf("sinkrate bench (one run; ratios are within this run)\n\n");

    size_t n = 2000000;
    double t_exp = per_call_exp(n);
    sr_atmos std;
    sr_atmos_init_standard(&std);
    double t_at = per_call_atmos(&std, n, 0);
    double t_rho = per_call_atmos(&std, n, 1);
    sr_atmos site;
    sr_atmos_init_site(&site, 1380.0, 311.15, 85800.0, NULL);
    double t_site = per_call_atmos(&site, n / 4, 0);
    printf("atmosphere (1976 standard), full state  %7.1f ns/call  = %.2fx exp()   (goal <= 3x)\n", t_at * 1e9,
           t_at / t_exp);
    printf("atmosphere (1976 standard), density     %7.1f ns/call  = %.2fx exp()\n", t_rho * 1e9, t_rho / t_exp);
    printf("atmosphere (site model), full state     %7.1f ns/call  = %.2fx exp()\n", t_site * 1e9, t_site / t_exp);
    printf("libm exp()                              %7.1f ns/call\n\n", t_exp * 1e9);

    char *size_argv[] = {(char *)"sinkrate", (char *)"size",   (char *)"--mass",   (char *)"5.3 kg",
                         (char *)"--speed",  (char *)"6 m/s",  (char *)"--family", (char *)"conical",
                         NULL};
    char *ver_argv[] = {(char *)"sinkrate", (char *)"--version", NULL};
    double t_size = process_time(bin, size_argv, 20);
    double t_ver = process_time(bin, ver_argv, 20);
    printf("whole process: sinkrate size ...        %7.2f ms  = %.2fx `sinkrate --version` (%.2f ms)\n",
           t_size * 1e3, t_size / t_ver, t_ver * 1e3);
    return 0;
}
