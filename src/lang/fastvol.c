/* The language's side of the polynomial-time volume engine (src/volumes): the session's table
   of normalised volumes V_{g',n'}, g' <= G, n' <= N, computed at once and only grown; the
   few-point volume polynomials V_{g,n}(L) (volumes/wpoly.h) and the sums that turn the
   engine's coefficients into integrals. Which integrals go here is route_volume.c's. */
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "correlators/pushforward.h"
#include "cancel.h"
#include "diag.h"
#include "progress.h"
#include "interp.h"
#include "util.h"
#include "volumes/wpvol.h"
#include "volumes/wpoly.h"
#include "correlators/wk.h"
#include "verify_account.h"
#include "fastvol.h"
#include "integrate.h"
#include "eval.h"
#include "failure.h"
#include "results.h"
#include "volume_table_store.h"

/* The same for V_{g,1} (correlator terms summed over the sorted
   multi-indices): measured with bench_wpoly, V_{10,1} (18460 terms) takes
   0.13 s by the reduction and 0.02 s by the engine's transposed route (0.12 s
   per index), V_{8,1} 0.02 s and 0.01 s: below the threshold both are fast.
   With n >= 2 the choice compares the two time estimates (fastvol_poly_wanted). */
#define FASTVOL_POLY_MIN_TERMS 10000.0

/* Refuse requests whose predicted memory is beyond the engine's own limit
   (8 GiB, a third of this machine's memory), before any work, with the estimate. */
#define FASTVOL_MAX_BYTES WPVOL_MAX_BYTES

/* Reports a failure of either volume engine in words (codes of wpvol.h). */
void fastvol_report(const node *where, int rc)
{
    char limit[160];
    snprintf(limit, sizeof limit, "this request is beyond the limits of the volume engine (%.3g s, %.3g GiB)",
             WPVOL_MAX_SECONDS, WPVOL_MAX_BYTES / 1073741824.0);
    const failure_words words[] = {
        {WPVOL_LIMIT, limit},
        {WPVOL_NOMEM, "the volume engine ran out of memory"},
        {WPVOL_INTERNAL, "the volume engine failed a consistency check (please report this input)"},
        {0, NULL},
    };
    failure_report(where, "the volume engine", rc, WPVOL_CANCELLED, words);
}

/* Every processor the system has online: the engine's primes are independent, so one value
   keeps them all busy (at least one prime per thread in the first batch). */
int fastvol_threads(void)
{
    long n = sysconf(_SC_NPROCESSORS_ONLN);
    return n < 1 ? 1 : n > FASTVOL_MAX_THREADS ? FASTVOL_MAX_THREADS : (int)n;
}

/* Threads for the table up to (G, N): every processor, but no more than the modelled number
   of primes, since the driver's first batch has at least one prime per thread and extra
   primes would only be extra work. */
static int fastvol_table_threads(slong G, slong N)
{
    double sec, each, root, primes;
    int t = fastvol_threads();
    wpvol_estimate_spread(&sec, &each, &root, &primes, G, N, 1);
    return primes >= 1.0 && primes < (double)t ? (int)primes : t;
}

/* The table that holds V_{g,n}: grown in steps, so that a loop over g or n does not recompute
   it each time. */
static void fastvol_table_size(const interp *I, slong g, slong n, slong *G, slong *N)
{
    *G = I->wpv ? I->wpv_G + I->wpv_G / 4 : g;
    *N = I->wpv ? I->wpv_N : 6;
    *G = g > *G ? g : *G;
    *N = n > *N ? n : *N;
}

const char *fastvol_table_cost(interp *I, slong g, slong n, double *seconds, char *msg, size_t len)
{
    *seconds = 0.0;
    if (I->wpv && g <= I->wpv_G && n <= I->wpv_N)
        return NULL;
    if (voltab_store_fill(I, g, n))   /* a stored table costs nothing to compute */
        return NULL;
    slong G, N;
    double bytes;
    fastvol_table_size(I, g, n, &G, &N);
    wpvol_estimate(seconds, &bytes, G, N);
    if (*seconds <= I->lim.max_seconds && bytes <= FASTVOL_MAX_BYTES)
        return NULL;
    snprintf(msg, len, "volumes up to genus %ld with %ld points need about %.3g s and %.3g GiB "
             "(limits: %.3g s, raise with --max-seconds S; %.3g GiB)", (long)G, (long)N, *seconds,
             bytes / 1073741824.0, I->lim.max_seconds, FASTVOL_MAX_BYTES / 1073741824.0);
    return *seconds > I->lim.max_seconds ? "the volume engine's time estimate is above --max-seconds"
                                         : "the volume engine's memory estimate is above its limit";
}

static int fastvol_grow(interp *I, const node *where, slong g, slong n)
{
    char msg[320];
    double sec;
    if (fastvol_table_cost(I, g, n, &sec, msg, sizeof msg)) {
        diag_error(&where->loc, "%s", msg);
        return 0;
    }
    if (I->wpv && g <= I->wpv_G && n <= I->wpv_N)
        return 1;
    slong G, N;
    fastvol_table_size(I, g, n, &G, &N);
    fmpq *t = _fmpq_vec_init((G + 1) * (N + 1));
    char what[96];
    snprintf(what, sizeof what, "volume engine: all V_{g,n} with g <= %ld, n <= %ld", (long)G, (long)N);
    progress_note(what, sec / 2);
    wpvol_set_cancel(&cancel_flag);
    double t0 = results_clock();
    int rc = wpvol_table(t, G, N, fastvol_table_threads(G, N));
    progress_clear_note(sec / 2);
    if (rc != WPVOL_OK) {
        _fmpq_vec_clear(t, (G + 1) * (N + 1));
        fastvol_report(where, rc);
        return 0;
    }
    voltab_adopt(I, t, G, N);
    voltab_store_keep(I, results_clock() - t0);
    return 1;
}

int fastvol_get(interp *I, const node *where, fmpq_t v, slong g, slong n)
{
    if (!fastvol_grow(I, where, g, n))
        return 0;
    fmpq_set(v, I->wpv + g * (I->wpv_N + 1) + n);
    return 1;
}

void fastvol_clear(interp *I)
{
    if (I->wpv)
        _fmpq_vec_clear(I->wpv, (I->wpv_G + 1) * (I->wpv_N + 1));
    I->wpv = NULL;
}

/* Correlator terms of the reduction of V_{g,n}(L): one kappa_1 pushforward
   per sorted multi-index (the reduction memoises on sorted indices). */
double fastvol_poly_terms(slong g, slong n, const slong *idx, slong nidx)
{
    double t = 0.0;
    for (slong k = 0; k < nidx; k++) {
        slong kmult[2] = {0, 3 * g - 3 + n};
        for (slong i = 0; i < n; i++)
            kmult[1] -= idx[k * n + i];
        t += pf_estimate_terms(kmult, 1);
    }
    return t;
}

/* Steps p[0..n) to the next permutation in lexicographic order (repeated
   entries give each distinct arrangement once); returns 0 after the last. */
static int fastvol_next_perm(slong *p, slong n)
{
    slong i = n - 2, j = n - 1, t;
    while (i >= 0 && p[i] >= p[i + 1])
        i--;
    if (i < 0)
        return 0;
    while (p[j] <= p[i])
        j--;
    t = p[i], p[i] = p[j], p[j] = t;
    for (slong l = i + 1, r = n - 1; l < r; l++, r--)
        t = p[l], p[l] = p[r], p[r] = t;
    return 1;
}

/* The powers the sums below need: cpow[j] = c^j and bpow[i (D+1) + k] = b_i^k/k!
   for j, k <= D (arrays of D+1 and n (D+1) entries, initialised here; the caller
   clears them). */
static void fastvol_exp_powers(interp *I, fmpq_mpoly_struct *cpow, fmpq_mpoly_struct *bpow, const fmpq_mpoly_t c,
                               const fmpq_mpoly_struct *b, slong n, slong D)
{
    for (slong j = 0; j <= D; j++) {
        fmpq_mpoly_init(cpow + j, I->ring.ctx);
        if (j == 0)
            fmpq_mpoly_one(cpow, I->ring.ctx);
        else
            fmpq_mpoly_mul(cpow + j, cpow + j - 1, c, I->ring.ctx);
    }
    for (slong i = 0; i < n; i++)
        for (slong k = 0; k <= D; k++) {
            fmpq_mpoly_struct *p = bpow + i * (D + 1) + k;
            fmpq_mpoly_init(p, I->ring.ctx);
            if (k == 0) {
                fmpq_mpoly_one(p, I->ring.ctx);
            } else {
                fmpq_mpoly_mul(p, p - 1, b + i, I->ring.ctx);
                fmpq_mpoly_scalar_div_si(p, p, k, I->ring.ctx);
            }
        }
}

/* res += W c^{D-|a|} sum over the arrangements p of the sorted a of prod_i b_i^{p_i}/p_i!:
   the terms of int exp(c kappa_1 + sum_i b_i psi_i) with psi exponents a, V being
   symmetric. cpow, bpow as made by fastvol_exp_powers (borrowed). */
static void fastvol_exp_add(interp *I, fmpq_mpoly_t res, const fmpq_t W, const slong *a, slong n, slong D,
                            const fmpq_mpoly_struct *cpow, const fmpq_mpoly_struct *bpow)
{
    slong s = 0, perm[WPOLY_MAX_POINTS];
    if (fmpq_is_zero(W))
        return;
    for (slong i = 0; i < n; i++) {
        s += a[i];
        perm[i] = a[n - 1 - i];   /* increasing: the first arrangement */
    }
    fmpq_mpoly_t t, sum;
    fmpq_mpoly_init(t, I->ring.ctx);
    fmpq_mpoly_init(sum, I->ring.ctx);
    do {
        fmpq_mpoly_set(t, bpow + perm[0], I->ring.ctx);
        for (slong i = 1; i < n; i++)
            fmpq_mpoly_mul(t, t, bpow + i * (D + 1) + perm[i], I->ring.ctx);
        fmpq_mpoly_add(sum, sum, t, I->ring.ctx);
    } while (fastvol_next_perm(perm, n));
    fmpq_mpoly_mul(sum, sum, cpow + D - s, I->ring.ctx);
    fmpq_mpoly_scalar_mul_fmpq(sum, sum, W, I->ring.ctx);
    fmpq_mpoly_add(res, res, sum, I->ring.ctx);
    fmpq_mpoly_clear(t, I->ring.ctx);
    fmpq_mpoly_clear(sum, I->ring.ctx);
}

/* int_{g,n} exp(c kappa_1 + sum_i b_i psi_i) from the coefficients w of the sorted multi-indices
   idx (all nidx of them, from wpoly_indices). Returns a new value. */
value *fastvol_exp_sum(interp *I, const fmpq *w, const slong *idx, slong nidx, slong n, slong D,
                       const fmpq_mpoly_t c, const fmpq_mpoly_struct *b)
{
    fmpq_mpoly_struct *cpow = flint_malloc((size_t)(D + 1) * (size_t)(n + 1) * sizeof(fmpq_mpoly_struct));
    fmpq_mpoly_struct *bpow = cpow + D + 1;
    fastvol_exp_powers(I, cpow, bpow, c, b, n, D);
    value *r = value_new_num(&I->ring);
    for (slong k = 0; k < nidx; k++)
        fastvol_exp_add(I, r->num, w + k, idx + k * n, n, D, cpow, bpow);
    for (slong j = 0; j < (D + 1) * (n + 1); j++)
        fmpq_mpoly_clear(cpow + j, I->ring.ctx);
    flint_free(cpow);
    return r;
}

const char *fastvol_poly_cost(const interp *I, slong g, slong n, const slong *idx, slong nidx, double *seconds,
                              char *msg, size_t len)
{
    double bytes, maxb = FASTVOL_MAX_BYTES;
    wpoly_estimate_at(seconds, &bytes, g, n, idx, nidx);
    if (*seconds <= I->lim.max_seconds && bytes <= maxb)
        return NULL;
    snprintf(msg, len, "%s on Mbar_{%ld,%ld} by the volume engine needs about %.3g s and %.3g GiB "
             "(limits: %.3g s, raise with --max-seconds S; %.3g GiB)", nidx > 1 ? "the volume polynomial"
             : "this integral", (long)g, (long)n, *seconds, bytes / 1073741824.0, I->lim.max_seconds,
             maxb / 1073741824.0);
    return *seconds > I->lim.max_seconds ? "the volume engine's time estimate is above --max-seconds"
                                         : "the volume engine's memory estimate is above its limit";
}

fmpq *fastvol_poly_run(interp *I, const node *where, slong g, slong n, const slong *idx, slong nidx)
{
    return fastvol_poly_run_route(I, where, g, n, idx, nidx, WPOLY_ROUTE_AUTO);
}

fmpq *fastvol_poly_run_route(interp *I, const node *where, slong g, slong n, const slong *idx, slong nidx,
                             int route)
{
    char msg[320];
    double sec, bytes;
    if (fastvol_poly_cost(I, g, n, idx, nidx, &sec, msg, sizeof msg)) {
        diag_error(&where->loc, "%s", msg);
        return NULL;
    }
    wpoly_estimate_at_route(&sec, &bytes, g, n, idx, nidx, route);
    fmpq *w = _fmpq_vec_init(nidx);
    char what[96];
    snprintf(what, sizeof what, "volume engine: V_{%ld,%ld}(L)", (long)g, (long)n);
    progress_note(what, sec / 2);
    wpvol_set_cancel(&cancel_flag);
    int rc = wpoly_coeffs_at_route(w, g, n, idx, nidx, fastvol_threads(), route);
    progress_clear_note(sec / 2);
    if (rc == WPVOL_OK)
        return w;
    _fmpq_vec_clear(w, nidx);
    fastvol_report(where, rc);
    return NULL;
}

int fastvol_reduction_refused(const interp *I, slong g, slong n)
{
    double sec, entries;
    if (n < 2 || n > WPOLY_MAX_POINTS)
        return wk_estimate_entries(g, n + 3 * g - 3 + n) > I->lim.max_table;
    wk_estimate_volume_reduction(&sec, &entries, g, n);
    return entries > I->lim.max_table;
}

double fastvol_reduction_seconds(slong g, slong n)
{
    double sec, entries;
    if (n < 2 || n > WPOLY_MAX_POINTS)
        return wk_estimate_seconds(wk_estimate_entries(g, n + 3 * g - 3 + n));
    wk_estimate_volume_reduction(&sec, &entries, g, n);
    return sec;
}

/* CPU seconds of the polynomial engine per second of wpoly_estimate (measured with bench_wpoly on
   the same machine as the reduction's model: V_{11,2} 3.14 s for an estimate of 2.0, V_{13,2}
   10.3 for 7.1, V_{11,3} 37.4 for 25.3, V_{8,4} 20.2 for 11.7). */
#define FASTVOL_ENGINE_PER_ESTIMATE 1.6

int fastvol_poly_wanted(interp *I, slong g, slong n, double terms, const slong *idx, slong nidx)
{
    double eng, bytes;
    if (I->route_volumes || fastvol_reduction_refused(I, g, n))
        return 1;
    if (n == 1)
        return terms > FASTVOL_POLY_MIN_TERMS;
    if (n > WPOLY_MAX_POINTS)
        return 0;
    wpoly_estimate_at(&eng, &bytes, g, n, idx, nidx);
    return FASTVOL_ENGINE_PER_ESTIMATE * eng / fastvol_threads() < fastvol_reduction_seconds(g, n);
}

