/* vincenty.h - an independent implementation, for the tests, of Vincenty's
 * inverse geodesic formula on the WGS 84 ellipsoid (T. Vincenty, "Direct and
 * inverse solutions of geodesics on the ellipsoid with application of nested
 * equations", Survey Review XXIII (176), 1975): distance and initial azimuth
 * between two points, good to about 0.5 mm away from nearly antipodal pairs. */
#ifndef SR_TEST_VINCENTY_H
#define SR_TEST_VINCENTY_H

#include <math.h>

#define SR_SRC_VINCENTY "Vincenty 1975 inverse formula (Survey Review 23(176)) on WGS 84, written in the test"

/* Returns 0, or -1 when the iteration does not converge. Degrees in, metres
 * and degrees (clockwise from north) out. */
static inline int sr_vincenty_inverse(double lat1, double lon1, double lat2, double lon2, double *s, double *azi1)
{
    const double a = 6378137.0, f = 1.0 / 298.257223563, b = a * (1.0 - f), d = 3.14159265358979323846 / 180.0;
    double L = (lon2 - lon1) * d;
    double U1 = atan((1.0 - f) * tan(lat1 * d)), U2 = atan((1.0 - f) * tan(lat2 * d));
    double sU1 = sin(U1), cU1 = cos(U1), sU2 = sin(U2), cU2 = cos(U2);
    double lam = L, sig = 0, ssig = 0, csig = 1, c2a = 1, c2sm = 0, sa;
    int it;
    for (it = 0; it < 200; it++) {
        double sl = sin(lam), cl = cos(lam);
        ssig = sqrt((cU2 * sl) * (cU2 * sl) + (cU1 * sU2 - sU1 * cU2 * cl) * (cU1 * sU2 - sU1 * cU2 * cl));
        if (ssig == 0.0) {
            *s = 0.0;
            *azi1 = 0.0;
            return 0;
        }
        csig = sU1 * sU2 + cU1 * cU2 * cl;
        sig = atan2(ssig, csig);
        sa = cU1 * cU2 * sl / ssig;
        c2a = 1.0 - sa * sa;
        c2sm = c2a != 0.0 ? csig - 2.0 * sU1 * sU2 / c2a : 0.0;
        double C = f / 16.0 * c2a * (4.0 + f * (4.0 - 3.0 * c2a));
        double prev = lam;
        lam = L + (1.0 - C) * f * sa * (sig + C * ssig * (c2sm + C * csig * (-1.0 + 2.0 * c2sm * c2sm)));
        if (fabs(lam - prev) < 1e-13)
            break;
    }
    if (it == 200)
        return -1;
    double u2 = c2a * (a * a - b * b) / (b * b);
    double A = 1.0 + u2 / 16384.0 * (4096.0 + u2 * (-768.0 + u2 * (320.0 - 175.0 * u2)));
    double B = u2 / 1024.0 * (256.0 + u2 * (-128.0 + u2 * (74.0 - 47.0 * u2)));
    double ds = B * ssig *
                (c2sm + B / 4.0 * (csig * (-1.0 + 2.0 * c2sm * c2sm) -
                                   B / 6.0 * c2sm * (-3.0 + 4.0 * ssig * ssig) * (-3.0 + 4.0 * c2sm * c2sm)));
    *s = b * A * (sig - ds);
    double sl = sin(lam), cl = cos(lam);
    double az = atan2(cU2 * sl, cU1 * sU2 - sU1 * cU2 * cl) / d;
    *azi1 = az < 0.0 ? az + 360.0 : az;
    return 0;
}

#endif
