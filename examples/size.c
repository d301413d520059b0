/* size.c - the conical canopy a 5.3 kg payload needs to touch down at
 * 6.1 m/s on a site 1380 m high, 38 C and 858 hPa (as `sinkrate size`). */
#include <sinkrate.h>
#include <stdio.h>

int main(void)
{
    sr_error *err = sr_error_new();
    sr_catalog *cat = NULL;
    sr_canopy *conical = NULL; /* a family at any size: sizing takes its drag band */
    sr_atmos *site = NULL;
    sr_sizing_result *s = NULL;
    int rc = sr_catalog_new(&cat, NULL, err) ||
             sr_canopy_new(&conical, sr_catalog_find(cat, "conical", err), SR_SIZE_NOMINAL_AREA, 1.0, err) ||
             sr_atmos_new_site(&site, 1380.0, 273.15 + 38.0, 85800.0, err) ||
             sr_sizing_new(&s, conical, 5.3, 6.1, 0.0, site, 1380.0, err);
    if (rc)
        fprintf(stderr, "size: %s\n", sr_error_message(err));
    else {
        sr_band d = sr_sizing_nominal_diameter(s), a = sr_sizing_nominal_area(s);
        printf("%s\n\nnominal diameter D0  %.3f / %.3f / %.3f m  (low / typical / high)\n", sr_caution(), d.lo,
               d.typ, d.hi);
        printf("nominal area S0      %.3f / %.3f / %.3f m2\n", a.lo, a.typ, a.hi);
    }
    sr_sizing_free(s), sr_atmos_free(site), sr_canopy_free(conical), sr_catalog_free(cat), sr_error_free(err);
    return rc ? 1 : 0;
}
