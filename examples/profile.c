/* profile.c - a mission flown over its bands, every limit judged at the band end (as `sinkrate profile`). */
#include <sinkrate.h>
#include <stdio.h>

int main(int argc, char **argv)
{
    sr_error *err = sr_error_new();
    sr_catalog *cat = NULL;
    sr_mission *m = NULL;
    sr_band_ctx *bc = NULL;
    sr_band_result *r = NULL;
    sr_judge_limits *lim = NULL;
    sr_verdict *v = NULL;
    if (argc != 2 || sr_catalog_new(&cat, NULL, err) || sr_mission_open(&m, argv[1], cat, err) ||
        sr_band_ctx_new(&bc, m, NULL, err) || sr_band_result_new(&r, err) || sr_judge_limits_new(&lim, m, err) ||
        sr_verdict_new(&v, err) || sr_band_run(bc, NULL, SR_PROFILE_FULL, NULL, r, NULL, err)) {
        fprintf(stderr, "profile: %s\n", argc != 2 ? "usage: profile MISSION.yaml" : sr_error_message(err));
        return 2;
    }
    sr_judge_band(lim, r, SR_JUDGE_BAND_END, v);
    printf("%s\n\n%s\n", sr_caution(), sr_mission_name(m));
    for (size_t i = 0; i < sr_verdict_rows(v); i++) {
        const sr_judge_row *j = sr_verdict_row(v, i);
        const char *unit = sr_units_label(sr_judge_kind_quantity(j->kind), SR_UNITS_SI);
        printf("  %-19s %-11s %8.4g %-3s limit %-6.4g %s\n", sr_judge_kind_name(j->kind),
               sr_judge_row_subject(m, j), j->judged, unit, j->limit, j->exceeded ? "EXCEEDED" : "met");
    }
    return sr_verdict_exceeded(v) ? 1 : 0; /* the process ends here: its memory goes with it */
}
