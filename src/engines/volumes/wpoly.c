/* wpoly.c - driver of the few-point volume polynomials (wpoly.h): the multi-indices, the size
 * and cost models, and the job handed to the multi-modular driver of wpvol.c (primes, threads,
 * Chinese remaindering, rational reconstruction confirmed by further primes).  The values
 * recovered are (D-|a|)! W_a = int psi^a kappa_1^{D-|a|}, whose denominators are small.
 */
#include <math.h>
#include <stdlib.h>

#include <flint/fmpz.h>

#include "wpoly.h"
#include "wpvol_internal.h"

/* Parameters of one request (lives on the stack of wpoly_coeffs_ex). */
typedef struct
{
    slong g, n, extra, nidx;
    const slong *idx;
    int adjoint;   /* the transposed route (n = 1) */
} wpoly_job_data_t;

/* Writes the sorted multi-indices with a_i <= cap and sum <= left from position i on
   (lexicographic); returns the running count. Recursion depth n <= WPOLY_MAX_POINTS. */
static slong wpoly_indices_rec(slong *idx, slong *cur, slong i, slong n, slong cap, slong left,
                               slong count)
{
    slong a, k;

    if (i == n)
    {
        if (idx != NULL)
            for (k = 0; k < n; k++)
                idx[count * n + k] = cur[k];
        return count + 1;
    }
    for (a = 0; a <= cap && a <= left; a++)
    {
        cur[i] = a;
        count = wpoly_indices_rec(idx, cur, i + 1, n, a, left - a, count);
    }
    return count;
}

/* See wpoly.h. */
slong wpoly_indices(slong *idx, slong g, slong n)
{
    slong cur[WPOLY_MAX_POINTS], D = 3 * g - 3 + n;

    if (g < 2 || n < 1 || n > WPOLY_MAX_POINTS)
        return 0;
    return wpoly_indices_rec(idx, cur, 0, n, D, D, 0);
}

static void *wpoly_job_ws_new(const wpvol_job_t *job)
{
    const wpoly_job_data_t *d = job->data;
    wpoly_ws_t *ws = wpoly_ws_new(d->g, d->n, d->extra, d->idx, d->nidx);
    wpoly_ws_set_adjoint(ws, d->adjoint);
    return ws;
}

static void wpoly_job_ws_free(void *ws)
{
    wpoly_ws_free(ws);
}

static int wpoly_job_run(void *ws, ulong *res, nmod_t mod)
{
    return wpoly_modp_run(ws, res, mod);
}

/* Model of the modulus bits of (D-|a|)! int psi^a kappa_1^{D-|a|}.  With the table's
   denominator multiple B of (g, n) (wpvol_estimate_den_mult), B times every one of these values
   has at most the bits of B W_{g,n}, the value a = 0 (measured on all multi-indices for
   n = 1, g <= 30 and n = 2, g <= 12, where B also divided every denominator, and n = 3,
   g <= 8), so the table's model holds for all of them.  Without it, the kappa_1 integral of the
   same space bounds them in practice (measured for g <= 20, n <= 3), plus room for the psi
   denominators (24^g g! for psi^D). */
static double wpoly_need_bits(slong g, slong n)
{
    if (wpvol_estimate_uses_mult(g, n))
        return wpvol_estimate_table_need(g, n);
    return wpvol_estimate_need_bits(g, n) + 2.0 * (double) g + 16.0;
}

/* The denominator multiple of every value of (g, n), or 1 where none is used. */
static void wpoly_job_mult(const wpvol_job_t *job, slong k, fmpz_t B)
{
    const wpoly_job_data_t *d = job->data;
    (void) k;
    if (wpvol_estimate_uses_mult(d->g, d->n))
        wpvol_estimate_den_mult(B, d->g, d->n);
    else
        fmpz_one(B);
}

static double wpoly_job_need(const wpvol_job_t *job, slong k)
{
    const wpoly_job_data_t *d = job->data;
    (void) k;
    return wpoly_need_bits(d->g, d->n);
}

static slong wpoly_job_den(const wpvol_job_t *job, slong k)
{
    const wpoly_job_data_t *d = job->data;
    (void) k;
    return (slong) wpvol_estimate_den_bits(d->g) + 2 * d->g;
}

/* Relative cost of one component with k perturbed points, summed over the genera G <= g:
   the pointwise sums over (G/2) 2^k pairs of transforms of length T_G, two transforms, and
   three d_0 (3G rows, quadratic products by I_2). */
static double wpoly_estimate_comp(slong g, slong n, slong k)
{
    double L = 3.0 * (double) g + (double) n - 3.0, w = 0.0;
    slong G;

    for (G = 2; G <= g; G++)
    {
        double T = 1.0;
        while (T < (3.0 * (double) G - 2.0) * (2.0 * L - 1.0))
            T *= 2.0;
        w += 0.5 * (double) G * pow(2.0, (double) k) * T * 1.3 + 2.0 * T * log2(T) * 0.75
             + 3.0 * 3.0 * (double) G * L * L / 2.0 * 0.9;
    }
    return w;
}

/* Relative cost of one prime for the multi-indices idx: the components wpoly_modp.c
   computes, replaying its reuse (a component is recomputed when the exponents of its points
   change; with n >= 2 a one-point component once per exponent).  *singles receives the
   number of one-point blocks kept (n >= 2). */
static double wpoly_estimate_work(slong g, slong n, const slong *idx, slong nidx, slong *singles)
{
    slong k, S, i, nm = WORD(1) << n, D = 3 * g - 3 + n, last[1 << WPOLY_MAX_POINTS];
    char *seen = calloc((size_t) (D + 1), 1);
    double w = wpoly_estimate_comp(g, n, 0), ck[WPOLY_MAX_POINTS + 1];

    *singles = 0;
    if (seen == NULL)
        return 1.0e30;   /* refused: the request could not run anyway */
    for (k = 0; k <= n; k++)
        ck[k] = wpoly_estimate_comp(g, n, k);
    for (S = 0; S < nm; S++)
        last[S] = -1;
    for (k = 0; k < nidx; k++)
    {
        const slong *a = idx + k * n;
        for (S = 1; S < nm; S++)
        {
            slong key = 0, pc = 0, ok = 1;
            for (i = 0; i < n; i++)
                if (S & (WORD(1) << i))
                {
                    ok &= a[i] >= 2;
                    key = key * (D + 1) + a[i];
                    pc++;
                }
            if (!ok || (n >= 2 && pc == 1 && seen[key]) || (!(n >= 2 && pc == 1) && last[S] == key))
                continue;
            if (n >= 2 && pc == 1)
            {
                seen[key] = 1;
                ++*singles;
            }
            last[S] = key;
            w += ck[pc];
        }
    }
    free(seen);
    /* one unit = 1 ns: within 10% of bench_wpoly's CPU seconds for (15,1), (25,1), (10,2),
       (13,2), (9,3) */
    return w * 1.0e-9;
}

/* Relative cost of one prime by the transposed route (n = 1, all indices): the plain
   recursion, then per genus the transposed step (three transposed d_0 and cross terms, rows
   of L terms, quadratic), one transform of length T_g and the pointwise sums over the g - k
   cached pairs for each k. */
static double wpoly_estimate_adjoint(slong g)
{
    double L = 3.0 * (double) g - 2.0, T = 1.0, w = wpoly_estimate_comp(g, 1, 0);
    slong G;

    while (T < (3.0 * (double) g - 2.0) * (2.0 * L - 1.0))
        T *= 2.0;
    for (G = 1; G <= g; G++)   /* 1.4: fitted on bench_wpoly side/new, g = 20..50 */
        w += 1.4 * ((double) (g - G) * T * 1.3 + 2.0 * T * log2(T) * 0.75
                    + 6.0 * 3.0 * (double) G * L * L / 2.0 * 0.9);
    return w * 1.0e-9;
}

/* 1 if the transposed route serves (g, n, nidx indices) under `route`. */
static int wpoly_use_adjoint(slong n, slong nidx, int route)
{
    if (n != 1 || route == WPOLY_ROUTE_PER_INDEX)
        return 0;
    return route == WPOLY_ROUTE_TRANSPOSED || nidx >= 3;
}

/* 1 if idx holds nidx >= 1 valid multi-indices of (g, n): sorted decreasingly, entries >= 0,
   sum <= D. */
static int wpoly_valid(slong g, slong n, const slong *idx, slong nidx)
{
    slong k, i;

    if (idx == NULL || nidx < 1 || g < 2 || n < 1 || n > WPOLY_MAX_POINTS)
        return 0;
    for (k = 0; k < nidx; k++)
    {
        slong s = 0;
        for (i = 0; i < n; i++)
        {
            if (idx[k * n + i] < 0 || (i > 0 && idx[k * n + i] > idx[k * n + i - 1]))
                return 0;
            s += idx[k * n + i];
        }
        if (s > 3 * g - 3 + n)
            return 0;
    }
    return 1;
}

/* See wpoly.h. */
void wpoly_estimate_at(double *seconds, double *bytes, slong g, slong n, const slong *idx,
                       slong nidx)
{
    wpoly_estimate_at_route(seconds, bytes, g, n, idx, nidx, WPOLY_ROUTE_AUTO);
}

/* See wpoly.h. */
void wpoly_estimate_at_route(double *seconds, double *bytes, slong g, slong n, const slong *idx,
                             slong nidx, int route)
{
    double L, primes, T, blocks;
    slong singles;

    *seconds = 0.0;
    *bytes = 0.0;
    if (!wpoly_valid(g, n, idx, nidx))
        return;
    L = 3.0 * (double) g + (double) n - 3.0;
    primes = wpoly_need_bits(g, n) / 61.0 + 3.0;
    singles = 0;
    *seconds = primes * (wpoly_use_adjoint(n, nidx, route)
                             ? wpoly_estimate_adjoint(g)
                             : wpoly_estimate_work(g, n, idx, nidx, &singles))
               + 1.0e-9 * (double) nidx * primes * primes * 20.0;
    /* component blocks (A, B, C: 3h rows of L words per genus; transforms; f) for the masks
       and the one-point blocks kept (n >= 2); residues and CRT values */
    for (T = 1.0; T < (3.0 * (double) g - 2.0) * (2.0 * L - 1.0);)
        T *= 2.0;
    blocks = pow(2.0, (double) n) + (double) singles;
    *bytes = 8.0 * blocks * (4.5 * (double) g * (double) g * L + (double) g * T + 3.0 * (double) g * L)
             + 32.0 * (double) nidx * primes;
}

/* See wpoly.h. */
void wpoly_estimate(double *seconds, double *bytes, slong g, slong n)
{
    slong nidx = wpoly_indices(NULL, g, n);
    slong *idx = nidx > 0 ? malloc((size_t) (nidx * n) * sizeof(slong)) : NULL;

    *seconds = 0.0;
    *bytes = 0.0;
    if (idx == NULL)
    {
        if (nidx > 0)
            *seconds = 1.0e30;   /* too large to list: refused */
        return;
    }
    wpoly_indices(idx, g, n);
    wpoly_estimate_at(seconds, bytes, g, n, idx, nidx);
    free(idx);
}

/* The driver run for the given multi-indices (validated by the callers); out has nidx
   entries, zeroed on error. */
static int wpoly_run(fmpq *out, slong g, slong n, const slong *idx, slong nidx, int threads,
                     int prime_bits, slong min_primes, slong extra, int route,
                     slong *primes_used)
{
    wpoly_job_data_t d;
    wpvol_job_t job;
    double sec, bytes;
    slong k;
    int status;

    for (k = 0; k < nidx; k++)
        fmpq_zero(out + k);
    wpoly_estimate_at_route(&sec, &bytes, g, n, idx, nidx, route);
    if (sec > WPVOL_MAX_SECONDS || bytes > WPVOL_MAX_BYTES)
        return WPVOL_LIMIT;
    d.g = g;
    d.n = n;
    d.extra = extra;
    d.nidx = nidx;
    d.idx = idx;
    d.adjoint = wpoly_use_adjoint(n, nidx, route);
    job.nv = nidx;
    job.ws_new = wpoly_job_ws_new;
    job.ws_free = wpoly_job_ws_free;
    job.run = wpoly_job_run;
    job.need_bits = wpoly_job_need;
    job.den_bits = wpoly_job_den;
    job.den_mult = wpoly_job_mult;
    job.first_bits = wpoly_need_bits(g, n);
    job.data = &d;
    status = wpvol_drive(out, &job, threads, prime_bits, min_primes, primes_used);
    /* (D-|a|)! W_a back to W_a */
    for (k = 0; status == WPVOL_OK && k < nidx; k++)
    {
        slong i, s = 3 * g - 3 + n;
        fmpz_t f;
        for (i = 0; i < n; i++)
            s -= idx[k * n + i];
        fmpz_init(f);
        fmpz_fac_ui(f, (ulong) s);
        fmpq_div_fmpz(out + k, out + k, f);
        fmpz_clear(f);
    }
    return status;
}

/* See wpoly.h. */
int wpoly_coeffs_ex(fmpq *out, slong g, slong n, int threads, int prime_bits, slong min_primes,
                    slong extra, slong *primes_used)
{
    return wpoly_coeffs_route(out, g, n, threads, prime_bits, min_primes, extra,
                              WPOLY_ROUTE_AUTO, primes_used);
}

/* See wpoly.h. */
int wpoly_coeffs_route(fmpq *out, slong g, slong n, int threads, int prime_bits,
                       slong min_primes, slong extra, int route, slong *primes_used)
{
    slong nidx, *idx;
    int status;

    if (primes_used != NULL)
        *primes_used = 0;
    if (out == NULL || g < 2 || n < 1 || n > WPOLY_MAX_POINTS || threads < 1 || prime_bits < 20
        || prime_bits > 63 || extra < 0 || extra > 1000 || route < WPOLY_ROUTE_AUTO
        || route > WPOLY_ROUTE_TRANSPOSED)
        return WPVOL_BADARG;
    nidx = wpoly_indices(NULL, g, n);
    idx = malloc((size_t) (nidx * n) * sizeof(slong));
    if (idx == NULL)
        return WPVOL_NOMEM;
    wpoly_indices(idx, g, n);
    status = wpoly_run(out, g, n, idx, nidx, threads, prime_bits, min_primes, extra, route,
                       primes_used);
    free(idx);
    return status;
}

/* See wpoly.h: primes of wpvol_default_prime_bits(), first batch from the size model, the
   proven truncation. */
int wpoly_coeffs(fmpq *out, slong g, slong n, int threads)
{
    return wpoly_coeffs_ex(out, g, n, threads, wpvol_default_prime_bits(), 1, 0, NULL);
}

/* See wpoly.h. */
int wpoly_coeffs_at(fmpq *out, slong g, slong n, const slong *idx, slong nidx, int threads)
{
    return wpoly_coeffs_at_route(out, g, n, idx, nidx, threads, WPOLY_ROUTE_AUTO);
}

/* See wpoly.h. */
int wpoly_coeffs_at_route(fmpq *out, slong g, slong n, const slong *idx, slong nidx, int threads,
                          int route)
{
    if (out == NULL || threads < 1 || !wpoly_valid(g, n, idx, nidx) || route < WPOLY_ROUTE_AUTO
        || route > WPOLY_ROUTE_TRANSPOSED)
        return WPVOL_BADARG;
    return wpoly_run(out, g, n, idx, nidx, threads, wpvol_default_prime_bits(), 1, 0, route,
                     NULL);
}
