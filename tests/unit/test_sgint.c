/* test_sgint.c - integrals of boundary strata and products with boundary divisors, checked by
 * classical divisor relations: each side of a relation is computed by a different route (psi or
 * kappa classes by the pushforward on Mbar_{g,n}, boundary divisors by strata and the pull-back
 * product with its excess term).
 */
#include <string.h>
#include <flint/fmpq.h>

#include "correlators/wk.h"
#include "strata/sgint.h"
#include "unit.h"

static wk_table *T;

/* L = the divisor D of Mbar_{g,n} as one term. */
static void divisor_terms(sg_terms *L, int g, int n, int irr, int h, ulong S)
{
    sgraph G;
    sg_divisor D = {irr, h, S};
    sg_terms_init(L);
    if (sg_divisor_graph(&G, g, n, &D) == SG_OK)
        sg_terms_push_stratum(L, &G);
}

/* L = the whole space Mbar_{g,n} (the trivial graph). */
static void unit_terms(sg_terms *L, int g, int n)
{
    sgraph G;
    sgraph_trivial(&G, g, n);
    sg_terms_init(L);
    sg_terms_push_stratum(L, &G);
}

/* res = int prod psi^a kappa^kmult * (D * X). */
static void int_times(fmpq_t res, const sg_divisor *D, const sg_terms *X, const slong *a, const slong *kmult, int kmax)
{
    sg_terms P;
    sg_terms_init(&P);
    sg_terms_times_divisor(&P, X, D, 0);
    sg_terms_integral(res, T, &P, a, kmult, kmax);
    sg_terms_clear(&P);
}

/* The classes X tried against each relation on Mbar_{g,n}: 1 and the divisors in ds[], and
   the products of two of them. */
typedef struct {
    int g, n, nd;
    sg_divisor ds[8];
} space;

static void build_tests(sg_terms *X, int *nx, const space *M)
{
    *nx = 0;
    unit_terms(&X[(*nx)++], M->g, M->n);
    for (int i = 0; i < M->nd; i++) {
        sgraph G;
        sg_terms_init(&X[*nx]);
        if (sg_divisor_graph(&G, M->g, M->n, &M->ds[i]) == SG_OK)
            sg_terms_push_stratum(&X[*nx], &G);
        (*nx)++;
    }
    for (int i = 0; i < M->nd; i++) {
        sg_terms_init(&X[*nx]);
        sg_terms_times_divisor(&X[*nx], &X[1 + i], &M->ds[i], 0);   /* self-intersections */
        (*nx)++;
    }
}

/* Checks int c . X = sum_k w_k int D_k . X for the classes X of build_tests and every
   monomial psi^a kappa^b completing the degree among a few given ones. lhs_a/lhs_k describe
   the class c itself as psi/kappa (c = psi_i or kappa_1). */
static void check_relation(unit_report *rep, const char *name, const space *M, int lhs_psi, const fmpq *w)
{
    sg_terms X[20];
    int nx, dim = 3 * M->g - 3 + M->n;
    build_tests(X, &nx, M);
    for (int x = 0; x < nx; x++) {
        /* fill the remaining degree with psi_1^e kappa_1^(r-e), e = 0..r */
        int codim = x == 0 ? 0 : x <= M->nd ? 1 : 2;
        int r = dim - 1 - codim;
        if (r < 0)
            continue;
        for (int e = 0; e <= r; e++) {
            slong a[SG_MAX_N] = {0}, kl[2] = {0, 0}, kr[2] = {0, 0};
            fmpq_t lhs, rhs, t;
            fmpq_init(lhs);
            fmpq_init(rhs);
            fmpq_init(t);
            if (M->n > 0)
                a[0] = e;
            else if (e > 0)
                continue;
            kl[1] = kr[1] = r - e;
            if (lhs_psi > 0)
                a[lhs_psi - 1]++;
            else
                kl[1]++;
            sg_terms_integral(lhs, T, &X[x], a, kl, 1);
            if (lhs_psi > 0)
                a[lhs_psi - 1]--;
            for (int k = 0; k < M->nd; k++) {
                int_times(t, &M->ds[k], &X[x], a, kr, 1);
                fmpq_addmul(rhs, w + k, t);
            }
            UNIT_CHECK(rep, fmpq_equal(lhs, rhs), "%s: test class %d, psi_1^%d kappa_1^%d", name, x, e, r - e);
            if (!fmpq_equal(lhs, rhs)) {
                unit_print_fmpq("lhs", lhs);
                unit_print_fmpq("rhs", rhs);
            }
            fmpq_clear(lhs);
            fmpq_clear(rhs);
            fmpq_clear(t);
        }
    }
    for (int x = 0; x < nx; x++)
        sg_terms_clear(&X[x]);
}

/* The divisor whose graph is the one-edge graph G. */
static sg_divisor divisor_of(const sgraph *G)
{
    sg_divisor D = {G->nv == 1, G->gv[0], 0};
    for (int i = 0; i < G->n && G->nv == 2; i++)
        if (G->legv[i] == 0)
            D.S |= 1UL << i;
    return D;
}

/* Property test: D_a [D_b] = D_b [D_a] for every pair of boundary divisors of Mbar_{g,n}, each
   side by its own pull-back (other vertex degenerations, other excess terms), integrated
   against psi_1^e kappa_1^{r-e}, r = 3g-5+n; returns the number of pairs with a nonzero value. */
static int check_commute(unit_report *rep, int g, int n)
{
    sg_list L;
    int nonzero = 0, r = 3 * g - 5 + n;
    sg_list_init(&L);
    sg_enumerate(&L, g, n, 1, 0, NULL);
    for (slong a = 0; a < L.len; a++)
        for (slong b = a + 1; b < L.len; b++) {
            sg_divisor Da = divisor_of(&L.gr[a]), Db = divisor_of(&L.gr[b]);
            sg_terms A, B;
            sg_terms_init(&A);
            sg_terms_init(&B);
            sg_terms_push_stratum(&A, &L.gr[a]);
            sg_terms_push_stratum(&B, &L.gr[b]);
            for (int e = 0; e <= r; e++) {
                slong psi[SG_MAX_N] = {0}, k[2] = {0, r - e};
                fmpq_t x, y;
                if (n == 0 && e > 0)
                    break;
                psi[0] = e;
                fmpq_init(x);
                fmpq_init(y);
                int_times(x, &Db, &A, psi, k, 1);
                int_times(y, &Da, &B, psi, k, 1);
                UNIT_CHECK(rep, fmpq_equal(x, y), "Mbar_{%d,%d}: divisors %ld and %ld do not commute", g, n, (long) a, (long) b);
                nonzero += !fmpq_is_zero(x);
                fmpq_clear(x);
                fmpq_clear(y);
            }
            sg_terms_clear(&A);
            sg_terms_clear(&B);
        }
    sg_list_clear(&L);
    return nonzero;
}

/* The generic-graph product [D] . [B] (Graber-Pandharipande) against the pull-back D . [B] for
   every divisor D and every graph B of Mbar_{g,n}, integrated against psi_1^e kappa_1^{r-e};
   returns the number of nonzero comparisons. */
static int check_products(unit_report *rep, int g, int n)
{
    sg_list Ds, Bs;
    int dim = 3 * g - 3 + n, nonzero = 0;
    sg_list_init(&Ds);
    sg_list_init(&Bs);
    sg_enumerate(&Ds, g, n, 1, 0, NULL);
    sg_enumerate(&Bs, g, n, -1, 0, NULL);
    for (slong a = 0; a < Ds.len; a++)
        for (slong b = 0; b < Bs.len; b++) {
            int r = dim - 1 - Bs.gr[b].ne;
            if (r < 0)
                continue;
            sg_divisor D = divisor_of(&Ds.gr[a]);
            sg_terms B, P, Q;
            sg_terms_init(&B);
            sg_terms_init(&P);
            sg_terms_init(&Q);
            sg_terms_push_stratum(&B, &Bs.gr[b]);
            sg_terms_times_divisor(&P, &B, &D, 0);
            int rc = sg_terms_product_graphs(&Q, &Ds.gr[a], &Bs.gr[b], 0);
            for (int e = 0; e <= r && rc == SG_OK; e++) {
                slong psi[SG_MAX_N] = {0}, k[2] = {0, r - e};
                fmpq_t x, y;
                if (n == 0 && e > 0)
                    break;
                psi[0] = e;
                fmpq_init(x);
                fmpq_init(y);
                sg_terms_integral(x, T, &P, psi, k, 1);
                sg_terms_integral(y, T, &Q, psi, k, 1);
                UNIT_CHECK(rep, fmpq_equal(x, y), "Mbar_{%d,%d}: divisor %ld times graph %ld, psi_1^%d kappa_1^%d", g, n,
                           (long) a, (long) b, e, r - e);
                nonzero += !fmpq_is_zero(x);
                fmpq_clear(x);
                fmpq_clear(y);
            }
            UNIT_CHECK(rep, rc == SG_OK, "generic-graph product failed");
            sg_terms_clear(&B);
            sg_terms_clear(&P);
            sg_terms_clear(&Q);
        }
    sg_list_clear(&Ds);
    sg_list_clear(&Bs);
    return nonzero;
}

int main(void)
{
    unit_report rep = {0, 0};
    fmpq w[8];
    T = wk_table_new();
    for (int i = 0; i < 8; i++)
        fmpq_init(w + i);

    /* int_{Mbar_{1,1}} delta_irr = 1/2: the loop flip (by hand, stack convention) */
    {
        sg_terms L;
        fmpq_t r;
        fmpq_init(r);
        divisor_terms(&L, 1, 1, 1, 0, 0);
        sg_terms_integral(r, T, &L, NULL, NULL, 0);
        UNIT_CHECK(&rep, fmpq_cmp_ui(r, 1) < 0 && fmpz_equal_si(fmpq_numref(r), 1) && fmpz_equal_si(fmpq_denref(r), 2),
                   "int_{Mbar_{1,1}} delta_irr = 1/2");
        sg_terms_clear(&L);
        fmpq_clear(r);
    }

    /* Mbar_{0,5}: psi_1 = sum of delta_{0,S} over S containing 1 and not 2, 3 (the standard
       genus-0 relation, e.g. Kock-Vainsencher, "An invitation to quantum cohomology", 2007) */
    {
        space M = {0, 5, 0, {{0}}};
        ulong sets[] = {0x1 | 0x8, 0x1 | 0x10, 0x1 | 0x8 | 0x10};  /* {1,4}, {1,5}, {1,4,5} */
        for (int k = 0; k < 3; k++) {
            M.ds[M.nd++] = (sg_divisor){0, 0, sets[k]};
            fmpq_one(w + k);
        }
        M.ds[M.nd++] = (sg_divisor){0, 0, 0x2 | 0x4};             /* {2,3}: a test class, weight 0 */
        fmpq_zero(w + 3);
        check_relation(&rep, "Mbar_{0,5} psi_1", &M, 1, w);
        /* each boundary divisor of Mbar_{0,5} is a (-1)-curve (Mbar_{0,5} is P^2 blown up in
           four points; by hand): delta_S^2 = -1 through the excess term alone */
        sg_terms X;
        fmpq_t r;
        fmpq_init(r);
        divisor_terms(&X, 0, 5, 0, 0, 0x1 | 0x8);
        int_times(r, &M.ds[0], &X, NULL, NULL, 0);
        UNIT_CHECK(&rep, fmpq_equal_si(r, -1), "delta_{0,{1,4}}^2 = -1 on Mbar_{0,5}");
        sg_terms_clear(&X);
        fmpq_clear(r);
    }

    /* Mbar_{1,2}: psi_1 = lambda_1 + delta_{0,{1,2}}, lambda_1 = delta_irr / 12 (from memory,
       e.g. Arbarello-Cornalba 1996; the check is the comparison of the two routes) */
    {
        space M = {1, 2, 2, {{1, 0, 0}, {0, 0, 0x3}}};
        fmpq_set_si(w + 0, 1, 12);
        fmpq_one(w + 1);
        check_relation(&rep, "Mbar_{1,2} psi_1", &M, 1, w);
    }

    /* Mbar_2: kappa_1 = 12 lambda_1 - delta with lambda_1 = delta_irr/10 + delta_1/5 (Mumford,
       "Towards an enumerative geometry of the moduli space of curves", 1983; from memory), so
       kappa_1 = delta_irr/5 + 7 delta_1/5 */
    {
        space M = {2, 0, 2, {{1, 0, 0}, {0, 1, 0}}};
        fmpq_set_si(w + 0, 1, 5);
        fmpq_set_si(w + 1, 7, 5);
        check_relation(&rep, "Mbar_2 kappa_1", &M, 0, w);
    }

    /* Mbar_{1,1}: kappa_1 = psi_1 = delta_irr / 12 */
    {
        space M = {1, 1, 1, {{1, 0, 0}}};
        fmpq_set_si(w + 0, 1, 12);
        check_relation(&rep, "Mbar_{1,1} kappa_1", &M, 0, w);
    }

    {
        int nz = 0;
        nz += check_commute(&rep, 0, 6);
        nz += check_commute(&rep, 1, 3);
        nz += check_commute(&rep, 2, 0);
        nz += check_commute(&rep, 2, 1);
        nz += check_commute(&rep, 3, 0);
        UNIT_CHECK(&rep, nz > 20, "commutation checks met only %d nonzero products", nz);
        printf("divisor products commuting: %d nonzero\n", nz);
        nz = 0;
        nz += check_products(&rep, 0, 5);
        nz += check_products(&rep, 0, 6);
        nz += check_products(&rep, 1, 2);
        nz += check_products(&rep, 1, 3);
        nz += check_products(&rep, 2, 0);
        nz += check_products(&rep, 2, 1);
        nz += check_products(&rep, 3, 0);
        UNIT_CHECK(&rep, nz > 50, "generic-graph products met only %d nonzero values", nz);
        printf("generic-graph products against pull-backs: %d nonzero\n", nz);
    }

    for (int i = 0; i < 8; i++)
        fmpq_clear(w + i);
    wk_table_free(T);
    return unit_finish("test_sgint", &rep);
}
