/* wk_estimate.c - a-priori bound on the memo size needed for all correlators of Mbar_{g,n}.
 *
 * Every recursive step lowers 2g-2+n and, when it lowers the genus by one, adds at most one point
 * (DVV: <tau_{k+1} tau_S>_g -> <tau_r tau_s tau_S>_{g-1}); string, dilaton and splitting never add
 * points at the same genus.  Hence every memo key met from Mbar_{g,n} has genus g' <= g and
 * n' <= n + g - g' points, with degree 3g'-3+n'.  Such keys are partitions of 3g'-3+n' into at most
 * n' parts, so their total count bounds the number of entries (exactly: it is an upper bound).
 */
#include <math.h>
#include <stdlib.h>
#include "wk.h"

/* Adds the counts of stable keys with n' = k points, given q[N] = #partitions of N into <= k parts.
   Only genera g' with k <= n + g - g' are reachable. */
static double wk_estimate_level(const double *q, slong Nmax, slong g, slong n, slong k)
{
    slong gp, N;
    double sum = 0.0;
    for (gp = 0; gp <= g && k <= n + g - gp; gp++) {
        if (2 * gp - 2 + k <= 0)
            continue;
        N = 3 * gp - 3 + k;
        if (N >= 0 && N <= Nmax)
            sum += q[N];
    }
    return sum;
}

/* Upper bound on memo entries for all correlators of Mbar_{g,n} (see the file comment).
   HUGE_VAL if g > 1000 or n > 1000: then the bound exceeds p(500) > 1e21 (g'=g/2, n'=g-g' term) or
   p(997) > 1e30 (g'=0, n'=n term), far beyond any feasible memo. */
double wk_estimate_entries(slong g, slong n)
{
    slong Nmax, k, N;
    double *q, total = 0.0;
    if (g < 0 || n < 0)
        return 0.0;
    if (g > 1000 || n > 1000)
        return HUGE_VAL;
    Nmax = 3 * g - 3 + n;
    if (Nmax < 0)
        return 0.0;
    q = calloc((size_t) (Nmax + 1), sizeof(double));
    if (q == NULL)
        return HUGE_VAL;
    q[0] = 1.0;                                   /* partitions into at most 0 parts */
    for (k = 0; k <= n + g; k++) {
        for (N = k; k > 0 && N <= Nmax; N++)
            q[N] += q[N - k];                     /* now q[N] = #partitions of N into <= k parts */
        total += wk_estimate_level(q, Nmax, g, n, k);
    }
    free(q);
    return total > 1e300 ? HUGE_VAL : total;
}

/* About 3 microseconds per table entry: DVV steps on numbers that grow with the genus (measured
   1-2.5 us for g = 10..12 with 1.5e5..2.9e6 entries). */
double wk_estimate_seconds(double entries)
{
    return entries >= 0 ? 3e-6 * entries : HUGE_VAL;
}
