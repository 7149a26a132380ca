/* The volume engine as a route of int_{g,n}: integrands of the Weil-Petersson forms it computes
   without expanding them (route.h, volume_form_kind), taken when the reduction would be large
   (FASTVOL_MIN_TERMS, or the session asks for it). Its check is the reduction. */
#include <stdlib.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "correlators/pushforward.h"
#include "fastvol.h"
#include "route.h"
#include "util.h"
#include "verify_account.h"

void volume_form_clear(integral *q)
{
    const fmpq_mpoly_ctx_struct *ctx = q->I->ring.ctx;
    fmpq_mpoly_clear(q->form.f, ctx);
    fmpq_mpoly_clear(q->form.c, ctx);
    for (slong i = 0; i < WPOLY_MAX_POINTS; i++)
        fmpq_mpoly_clear(q->form.b + i, ctx);
}

/* f psi^a kappa_1^k (exp(c kappa_1)) with some a_i > 0 on a space the polynomial engine takes;
   a is kept sorted decreasingly, as V_{g,n} is symmetric. */
static int volume_form_match_psi(integral *q)
{
    volume_form *F = &q->form;
    slong D = 3 * q->g - 3 + q->n, s = 0;
    cx_monomial m;
    fmpq_mpoly_init(m.factor, q->I->ring.ctx);
    fmpq_mpoly_init(m.c, q->I->ring.ctx);
    int ok = cx_match_psi_kappa1(q->integrand->cls, q->n, &m);
    for (slong i = 0; ok && i < q->n; i++) {
        slong x = m.psi[i], j = i;
        for (; j > 0 && F->psi[j - 1] < x; j--)
            F->psi[j] = F->psi[j - 1];
        F->psi[j] = x;
        s += x;
    }
    slong j = D - s - (ok ? m.kappa1 : 0);
    ok = ok && s > 0 && j >= 0 && (m.is_exp || j == 0);
    if (ok) {
        fmpq_mpoly_swap(F->f, m.factor, q->I->ring.ctx);
        fmpq_mpoly_swap(F->c, m.c, q->I->ring.ctx);
        F->psi_degree = s;
        F->kappa1 = m.kappa1;
        F->is_exp = m.is_exp;
    }
    fmpq_mpoly_clear(m.factor, q->I->ring.ctx);
    fmpq_mpoly_clear(m.c, q->I->ring.ctx);
    return ok;
}

/* Which form e has, with its parts in f, c and b (initialised by the caller). */
static volume_form_kind volume_form_read(integral *q, fmpq_mpoly_t f, fmpq_mpoly_t c, fmpq_mpoly_struct *b)
{
    slong g = q->g, n = q->n, k = 0, D = 3 * g - 3 + n;
    const cx *e = q->integrand->cls;
    int poly_space = g >= 2 && n >= 1 && n <= WPOLY_MAX_POINTS;
    if (cx_match_exp_kappa1(e, c, f))
        return VOLUME_FORM_EXP_KAPPA1;
    if (cx_match_kappa1_power(e, c, &k) && k == D)
        return VOLUME_FORM_KAPPA1_POWER;
    if (poly_space && volume_form_match_psi(q))
        return VOLUME_FORM_PSI_KAPPA1;
    if (poly_space && cx_match_exp_linear(e, n, f, c, b) && !fmpq_mpoly_is_zero(c, q->I->ring.ctx))
        return VOLUME_FORM_EXP_LINEAR;
    return VOLUME_FORM_NONE;
}

void volume_form_match(integral *q)
{
    volume_form *F = &q->form;
    const fmpq_mpoly_ctx_struct *ctx = q->I->ring.ctx;
    fmpq_mpoly_init(F->f, ctx);
    fmpq_mpoly_init(F->c, ctx);
    for (slong i = 0; i < WPOLY_MAX_POINTS; i++)
        fmpq_mpoly_init(F->b + i, ctx);
    F->kind = VOLUME_FORM_NONE;
    if (q->family != INTEGRAND_PSI_KAPPA || q->integrand->kind != V_CLASS || 2 * q->g - 2 + q->n <= 0)
        return;
    fmpq_mpoly_t f, c;
    fmpq_mpoly_init(f, ctx);
    fmpq_mpoly_init(c, ctx);
    F->kind = volume_form_read(q, f, c, F->b);
    if (F->kind != VOLUME_FORM_PSI_KAPPA1) {   /* that form keeps its own factor and coefficient */
        fmpq_mpoly_swap(F->f, f, ctx);
        fmpq_mpoly_swap(F->c, c, ctx);
    }
    fmpq_mpoly_clear(f, ctx);
    fmpq_mpoly_clear(c, ctx);
}

/* The sorted multi-indices of V_{g,n}(L) (caller frees), their number in *nidx. */
static slong *volume_indices(slong g, slong n, slong *nidx)
{
    *nidx = wpoly_indices(NULL, g, n);
    slong *idx = xmalloc((size_t)(*nidx * n) * sizeof(slong));
    wpoly_indices(idx, g, n);
    return idx;
}

static int volume_applies(integral *q)
{
    interp *I = q->I;
    slong D = 3 * q->g - 3 + q->n, kmult[2] = {0, D}, nidx;
    switch (q->form.kind) {
    case VOLUME_FORM_EXP_KAPPA1:
    case VOLUME_FORM_KAPPA1_POWER:
        return I->route_volumes || pf_estimate_terms(kmult, 1) > FASTVOL_MIN_TERMS;
    case VOLUME_FORM_PSI_KAPPA1:
        kmult[1] = D - q->form.psi_degree;
        return I->route_volumes || pf_estimate_terms(kmult, 1) > FASTVOL_MIN_TERMS;
    case VOLUME_FORM_EXP_LINEAR: {
        slong *idx = volume_indices(q->g, q->n, &nidx);
        int wanted = fastvol_poly_wanted(I, q->g, q->n, fastvol_poly_terms(q->g, q->n, idx, nidx), idx, nidx);
        free(idx);
        return wanted;
    }
    default:
        return 0;
    }
}

static void volume_estimate(integral *q, route_cost *cost)
{
    slong nidx;
    if (q->form.kind == VOLUME_FORM_EXP_KAPPA1 || q->form.kind == VOLUME_FORM_KAPPA1_POWER) {
        cost->refusal = fastvol_table_cost(q->I, q->g, q->n, &cost->seconds, cost->msg, sizeof cost->msg);
    } else if (q->form.kind == VOLUME_FORM_PSI_KAPPA1) {
        cost->refusal = fastvol_poly_cost(q->I, q->g, q->n, q->form.psi, 1, &cost->seconds, cost->msg,
                                          sizeof cost->msg);
    } else {
        slong *idx = volume_indices(q->g, q->n, &nidx);
        cost->refusal = fastvol_poly_cost(q->I, q->g, q->n, idx, nidx, &cost->seconds, cost->msg, sizeof cost->msg);
        free(idx);
    }
}

/* f c^D V (exp) or c D! V (kappa_1^D), V the normalised volume. */
static value *volume_run_table(integral *q)
{
    interp *I = q->I;
    slong D = 3 * q->g - 3 + q->n;
    fmpq_t V;
    fmpq_init(V);
    value *r = NULL;
    if (fastvol_get(I, q->where, V, q->g, q->n)) {
        r = value_new_num(&I->ring);
        if (q->form.kind == VOLUME_FORM_EXP_KAPPA1) {
            fmpq_mpoly_pow_ui(r->num, q->form.c, (ulong)D, I->ring.ctx);
            fmpq_mpoly_mul(r->num, r->num, q->form.f, I->ring.ctx);
        } else {
            fmpz_t f;
            fmpz_init(f);
            fmpz_fac_ui(f, (ulong)D);
            fmpq_mpoly_scalar_mul_fmpz(r->num, q->form.c, f, I->ring.ctx);
            fmpz_clear(f);
        }
        fmpq_mpoly_scalar_mul_fmpq(r->num, r->num, V, I->ring.ctx);
    }
    fmpq_clear(V);
    return r;
}

/* f c^j/j! (D-|a|)! W_a, j = D - |a| - k: the coefficient of kappa_1^{D-|a|} from exp(c kappa_1),
   W_a from the polynomial engine. */
static value *volume_run_psi(integral *q)
{
    interp *I = q->I;
    const volume_form *F = &q->form;
    slong D = 3 * q->g - 3 + q->n, s = F->psi_degree, j = D - s - F->kappa1;
    fmpq *w = fastvol_poly_run(I, q->where, q->g, q->n, F->psi, 1);
    if (!w)
        return NULL;
    fmpz_t f;
    fmpz_init(f);
    value *r = value_new_num(&I->ring);
    fmpq_mpoly_pow_ui(r->num, F->c, (ulong)j, I->ring.ctx);
    fmpz_fac_ui(f, (ulong)j);
    fmpq_mpoly_scalar_div_fmpz(r->num, r->num, f, I->ring.ctx);
    fmpz_fac_ui(f, (ulong)(D - s));
    fmpq_mpoly_scalar_mul_fmpz(r->num, r->num, f, I->ring.ctx);
    fmpq_mpoly_scalar_mul_fmpq(r->num, r->num, w, I->ring.ctx);
    fmpq_mpoly_mul(r->num, r->num, F->f, I->ring.ctx);
    fmpz_clear(f);
    _fmpq_vec_clear(w, 1);
    return r;
}

/* f int exp(c kappa_1 + sum_i b_i psi_i) from every coefficient of V_{g,n}(L). */
static value *volume_run_exp_linear(integral *q)
{
    interp *I = q->I;
    slong nidx, D = 3 * q->g - 3 + q->n;
    slong *idx = volume_indices(q->g, q->n, &nidx);
    fmpq *w = fastvol_poly_run(I, q->where, q->g, q->n, idx, nidx);
    value *r = NULL;
    if (w) {
        r = fastvol_exp_sum(I, w, idx, nidx, q->n, D, q->form.c, q->form.b);
        fmpq_mpoly_mul(r->num, r->num, q->form.f, I->ring.ctx);
        _fmpq_vec_clear(w, nidx);
    }
    free(idx);
    return r;
}

/* The engine has no limit below its estimate, so as a check it runs or reports like a first route. */
static value *volume_integrate(integral *q, route_check *check)
{
    (void)check;
    if (q->form.kind == VOLUME_FORM_PSI_KAPPA1)
        return volume_run_psi(q);
    if (q->form.kind == VOLUME_FORM_EXP_LINEAR)
        return volume_run_exp_linear(q);
    return volume_run_table(q);
}

const route route_volume_engine = {
    "the volume engine", volume_applies, volume_estimate, volume_integrate, &route_reduction,
};
