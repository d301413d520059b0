/* profile_fast.c - the closed-form transient behind the fast mode. After a
 * deployment at constant density and gravity, with a fully open canopy of
 * steady rate vt and no filling time, the downward airspeed obeys
 * dv/dt = g (1 - v^2/vt^2): v = vt tanh(...) from below, vt coth(...) from
 * above. Integrating the gap to vt over the whole descent gives the time the
 * real descent lags behind a steady one started at the same height:
 *     lag_t = (vt/g) ln(2 / (1 + r)),   r = v0 / vt
 * (ln 2 from rest; negative when the body arrives faster than vt). A
 * horizontal airspeed u0 decays as u0 exp(-g s / vt^2) with s the distance
 * fallen (small-u0 linearisation), which carries the body a distance
 *     lag_x = u0 (vt/g) psi(r),  psi = acos(r)/sqrt(1-r^2) (r<1), acosh(r)/sqrt(r^2-1) (r>1), 1 (r=1)
 * beyond the wind (pi/2 from rest). The fast mode keeps the exact nominal
 * transient (ODE, filling, 3-D coupling, varying air) and adds only the
 * change of these closed forms between the nominal and the sample, so the
 * nominal sample is reproduced and small perturbations are first-order right.
 * These derivations are ours (checked against the ODE in tests/test_profile.c). */
#include <math.h>

#include "physics/profile_int.h"

double sr_profile_lag_time(double v0, double vt, double g)
{
    if (!(vt > 0.0) || !isfinite(vt) || !(g > 0.0))
        return 0.0;
    double r = v0 > 0.0 ? v0 / vt : 0.0; /* rising starts are left to the cached ODE part */
    return vt / g * log(2.0 / (1.0 + r));
}

static double psi(double r)
{
    double d = r - 1.0;
    if (fabs(d) < 1e-4)
        return 1.0 - d / 3.0 + 2.0 * d * d / 15.0; /* series of both branches at r = 1 */
    if (r < 1.0)
        return acos(r) / sqrt(1.0 - r * r);
    return acosh(r) / sqrt(r * r - 1.0);
}

double sr_profile_lag_distance(double u0, double v0, double vt, double g)
{
    if (!(vt > 0.0) || !isfinite(vt) || !(g > 0.0))
        return 0.0;
    double r = v0 > 0.0 ? v0 / vt : 0.0;
    return u0 * vt / g * psi(r);
}
