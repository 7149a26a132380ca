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

/* Fitted on `bench_wpoly ref` runs (gcc -O2, FLINT 2.9, the project's 2-core VM, idle): n = 2 for
   g = 9, 11..15; n = 3 for g = 7, 9, 11, 12; n = 4 for g = 5, 7..10; n = 5 for g = 6..8.  The time
   is within 25 % on every run of 0.05 s or more; the table within 15 % from g = 10 on, and above
   the measured count below that (by up to 2.5 times).  E.g. V_{13,2}: 3.46 s and 194141 entries;
   V_{15,2}: 21.1 s and 589752; V_{11,3}: 1.02 s and 89826.  Each genus multiplies the time by about 2.5 and the table by
   1.75, each point by 1.85 and 1.5: numbers grow with the genus, the tables with the points. */
void wk_estimate_volume_reduction(double *seconds, double *entries, slong g, slong n)
{
    *seconds = 6.8e-6 * pow(2.5, (double) g) * pow(1.85, (double) n);
    *entries = 60.0 * pow(1.75, (double) g) * pow(1.5, (double) n);
}
