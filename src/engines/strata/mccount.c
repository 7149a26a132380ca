/* mccount.c - integrated counting polynomials of multicurve types (mccount.h). */
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "correlators/pushforward.h"
#include "mccount.h"
#include "sgint.h"

typedef struct {
    const sg_dec *D;
    wk_table *T;
    fmpq *coef;
    slong a[SG_MAX_H];            /* psi exponent a_h at each half-edge */
    int rc;
} mc_state;

/* All vertices chosen: integrate over the simplex and add coeff to the pi^{2j} slot. */
static void mc_leaf(mc_state *S, const fmpq_t coeff, slong j)
{
    const sg_dec *D = S->D;
    fmpz_t f;
    fmpq_t c;
    slong total = 0;
    fmpz_init(f);
    fmpq_init(c);
    fmpq_set(c, coeff);
    for (int h = D->n; h < D->nh; h += 2) {      /* halves h, h+1 of one edge */
        slong m = 1 + 2 * (S->a[h] + S->a[h + 1]);
        fmpz_fac_ui(f, (ulong) m);
        fmpq_mul_fmpz(c, c, f);
        total += m + 1;
    }
    fmpz_fac_ui(f, (ulong) total);
    fmpq_div_fmpz(c, c, f);
    fmpq_add(S->coef + j, S->coef + j, c);
    fmpz_clear(f);
    fmpq_clear(c);
}

static void mc_vertex(mc_state *S, int v, const fmpq_t coeff, slong j);

/* Chooses a_h for the non-leg half-edges hv[k..] of vertex v with at most `rest` left. */
static void mc_choose(mc_state *S, int v, const int *hv, int nh, int k, slong rest, const fmpq_t coeff, slong j)
{
    const sg_dec *D = S->D;
    if (S->rc != SG_OK)
        return;
    if (k < nh) {
        for (slong a = 0; a <= rest; a++) {
            S->a[hv[k]] = a;
            mc_choose(S, v, hv, nh, k + 1, rest - a, coeff, j);
        }
        S->a[hv[k]] = 0;
        return;
    }
    slong d[SG_MAX_H] = {0}, kmult[2] = {0, rest};
    int nv = 0;
    fmpq_t x, c;
    fmpz_t f;
    fmpq_init(x);
    fmpq_init(c);
    fmpz_init(f);
    for (int h = 0; h < D->nh; h++)
        if (D->vert[h] == v)
            d[nv++] = h < D->n ? 0 : S->a[h];
    int st = pf_integral(x, S->T, D->gv[v], d, nv, kmult, 1);
    if (st != WK_OK)
        S->rc = st == WK_CANCELLED ? SG_CANCELLED : SG_LIMIT;
    fmpq_mul(c, coeff, x);
    fmpz_fac_ui(f, (ulong) rest);                     /* kappa_1^r / r! times 2^r (pi^{2r} apart) */
    fmpq_div_fmpz(c, c, f);
    fmpq_mul_2exp(c, c, (ulong) rest);
    for (int k2 = 0; k2 < nv; k2++) {                 /* / prod 2^{a_i} a_i! */
        fmpz_fac_ui(f, (ulong) d[k2]);
        fmpq_div_fmpz(c, c, f);
        fmpq_div_2exp(c, c, (ulong) d[k2]);
    }
    if (S->rc == SG_OK && !fmpq_is_zero(c))
        mc_vertex(S, v + 1, c, j + rest);
    fmpq_clear(x);
    fmpq_clear(c);
    fmpz_clear(f);
}

static void mc_vertex(mc_state *S, int v, const fmpq_t coeff, slong j)
{
    const sg_dec *D = S->D;
    if (v == D->nv) {
        mc_leaf(S, coeff, j);
        return;
    }
    int hv[SG_MAX_H], nh = 0, nv = 0;
    for (int h = 0; h < D->nh; h++)
        if (D->vert[h] == v) {
            nv++;
            if (h >= D->n)
                hv[nh++] = h;
        }
    mc_choose(S, v, hv, nh, 0, 3 * D->gv[v] - 3 + nv, coeff, j);
}

int mc_count_poly(fmpq *coef, const sgraph *G, wk_table *T)
{
    sg_dec D;
    mc_state S;
    int dim = 3 * G->g - 3 + G->n;
    for (int j = 0; j <= dim; j++)
        fmpq_zero(coef + j);
    if (G->ne == 0)
        return SG_BADARG;
    sg_dec_from_graph(&D, G);
    memset(&S, 0, sizeof S);
    S.D = &D, S.T = T, S.coef = coef;
    fmpq_t one;
    fmpz_t aut;
    fmpq_init(one);
    fmpz_init(aut);
    fmpq_one(one);
    mc_vertex(&S, 0, one, 0);
    if (S.rc == SG_OK)
        S.rc = sgraph_aut(aut, G);
    for (int j = 0; j <= dim; j++)
        if (S.rc == SG_OK)
            fmpq_div_fmpz(coef + j, coef + j, aut);
        else
            fmpq_zero(coef + j);
    fmpq_clear(one);
    fmpz_clear(aut);
    return S.rc;
}
