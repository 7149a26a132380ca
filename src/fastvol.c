/* Routing of recognisable Weil-Petersson integrals to the polynomial-time
   volume engine (src/volumes): int[g,n] exp(c*kappa_1) and int[g,n] c*kappa_1^k.
   The engine fills a table of all V_{g',n'} with g' <= G, n' <= N at once,
   so the table is kept for the session and only grown. */
#include <stdlib.h>

#include "correlators/pushforward.h"
#include "cancel.h"
#include "diag.h"
#include "progress.h"
#include "interp.h"
#include "util.h"
#include "volumes/wpvol.h"

/* Below this many correlator terms the reduction is as fast as the engine,
   and it stays the reference route. */
#define FASTVOL_MIN_TERMS 2000.0

/* Refuse tables whose predicted memory is beyond this (the machine has 24 GiB). */
#define FASTVOL_MAX_BYTES (16.0 * 1073741824.0)

static int fastvol_grow(interp *I, const node *where, slong g, slong n)
{
    if (I->wpv && g <= I->wpv_G && n <= I->wpv_N)
        return 1;
    /* grow in steps, so that a loop over g or n does not recompute the table each time */
    slong G = I->wpv ? I->wpv_G + I->wpv_G / 4 : g, N = I->wpv ? I->wpv_N : 6;
    G = g > G ? g : G;
    N = n > N ? n : N;
    double sec, bytes;
    wpvol_estimate(&sec, &bytes, G, N);
    if (sec > I->lim.max_seconds || bytes > FASTVOL_MAX_BYTES) {
        diag_error(&where->loc, "volumes up to genus %ld with %ld points need about %.3g s and %.3g GiB "
                   "(limits: %.3g s, raise with --max-seconds S; %.3g GiB)", (long)G, (long)N, sec,
                   bytes / 1073741824.0, I->lim.max_seconds, FASTVOL_MAX_BYTES / 1073741824.0);
        return 0;
    }
    fmpq *t = _fmpq_vec_init((G + 1) * (N + 1));
    char what[96];
    snprintf(what, sizeof what, "volume engine: all V_{g,n} with g <= %ld, n <= %ld", (long)G, (long)N);
    progress_note(what, sec / 2);
    wpvol_set_cancel(&cancel_flag);
    int rc = wpvol_table(t, G, N, 2);
    progress_clear_note(sec / 2);
    if (rc != WPVOL_OK) {
        _fmpq_vec_clear(t, (G + 1) * (N + 1));
        if (rc == WPVOL_CANCELLED || cancel_flag)
            eval_cancelled(where);
        else
            diag_error(&where->loc, "the volume engine failed (code %d)", rc);
        return 0;
    }
    if (I->wpv)
        _fmpq_vec_clear(I->wpv, (I->wpv_G + 1) * (I->wpv_N + 1));
    I->wpv = t;
    I->wpv_G = G;
    I->wpv_N = N;
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

/* The integral as f c^D V (exp) or c D! V (power k = D), V normalised. */
static value *fastvol_scale(interp *I, const fmpq_t V, const fmpq_mpoly_t c, const fmpq_mpoly_t f, slong D,
                            int is_exp)
{
    value *r = value_new_num(&I->ring);
    if (is_exp) {
        fmpq_mpoly_pow_ui(r->num, c, (ulong)D, I->ring.ctx);
        fmpq_mpoly_mul(r->num, r->num, f, I->ring.ctx);
    } else {
        fmpz_t f;
        fmpz_init(f);
        fmpz_fac_ui(f, (ulong)D);
        fmpq_mpoly_scalar_mul_fmpz(r->num, c, f, I->ring.ctx);
        fmpz_clear(f);
    }
    fmpq_mpoly_scalar_mul_fmpq(r->num, r->num, V, I->ring.ctx);
    return r;
}

value *fastvol_try(interp *I, const node *where, slong g, slong n, const value *integrand, int *handled)
{
    *handled = 0;
    if (integrand->kind != V_CLASS || 2 * g - 2 + n <= 0)
        return NULL;
    slong D = 3 * g - 3 + n, k = 0, kmult[2] = {0, D};
    fmpq_mpoly_t c, f;
    fmpq_mpoly_init(c, I->ring.ctx);
    fmpq_mpoly_init(f, I->ring.ctx);
    int is_exp = cx_match_exp_kappa1(integrand->cls, c, f);
    int is_pow = !is_exp && cx_match_kappa1_power(integrand->cls, c, &k) && k == D;
    value *r = NULL;
    if ((is_exp || is_pow) && (I->route_volumes || pf_estimate_terms(kmult, 1) > FASTVOL_MIN_TERMS)) {
        *handled = 1;
        fmpq_t V;
        fmpq_init(V);
        if (fastvol_get(I, where, V, g, n))
            r = fastvol_scale(I, V, c, f, D, is_exp);
        fmpq_clear(V);
    }
    fmpq_mpoly_clear(c, I->ring.ctx);
    fmpq_mpoly_clear(f, I->ring.ctx);
    return r;
}
