/* test_mvvol.c - Masur-Veech volumes by the stable-graph formula: published values, the
 * correlators by two routes (DVV table and the KdV recursion), and the genus-two frequencies of
 * simple closed geodesics.
 */
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "strata/mccount.h"
#include "strata/mvvol.h"
#include "unit.h"

static int vol_is(const mv_source *src, int g, int n, long p, long q)
{
    fmpq_t v, e;
    fmpq_init(v);
    fmpq_init(e);
    fmpq_set_si(e, p, (ulong) q);
    int ok = mv_volume(v, g, n, src, 0, NULL) == SG_OK && fmpq_equal(v, e);
    if (!ok)
        unit_print_fmpq("Vol / pi^(6g-6+2n)", v);
    fmpq_clear(v);
    fmpq_clear(e);
    return ok;
}

int main(void)
{
    unit_report rep = {0, 0};
    wk_table *T = wk_table_new();
    wk_kdv_table *K = wk_kdv_table_new();
    mv_source dvv = {T, NULL}, kdv = {NULL, K};

    /* Athreya-Eskin-Zorich, "Right-angled billiards and volumes of moduli spaces of quadratic
       differentials on CP^1" (Ann. Sci. ENS 2016): Vol Q_{0,n} = 4 (pi^2/2)^{n-3}, i.e.
       2^{5-n} pi^{2n-6} (from memory; here the graph sum is the second route).  n <= 8: the
       trees of Mbar_{0,9} already number 660032. */
    for (int n = 4; n <= 8; n++)
        UNIT_CHECK(&rep, vol_is(&dvv, 0, n, n <= 5 ? 1L << (5 - n) : 1, n <= 5 ? 1 : 1L << (n - 5)),
                   "AEZ Vol Q_{0,%d}", n);

    /* The same closed form for n <= 12 (the range; 3g-3+n = 9 at n = 12) and on to
       n = 15, by the sum over shapes (graphs with unlabelled legs): about 10^10 labelled trees at
       n = 12, a few thousand shapes. */
    for (int n = 4; n <= 15; n++) {
        fmpq_t v, e;
        fmpq_init(v);
        fmpq_init(e);
        fmpq_set_si(e, 1, 1);
        if (n <= 5)
            fmpz_mul_2exp(fmpq_numref(e), fmpq_numref(e), (ulong) (5 - n));
        else
            fmpz_mul_2exp(fmpq_denref(e), fmpq_denref(e), (ulong) (n - 5));
        int rc = mv_volume_by_shapes(v, 0, n, &dvv, 0, NULL);
        UNIT_CHECK(&rep, rc == SG_OK && fmpq_equal(v, e), "AEZ Vol Q_{0,%d} by shapes", n);
        fmpq_clear(v);
        fmpq_clear(e);
    }

    /* Delecroix-Goujard-Zograf-Zorich (Duke 2021), table of Vol Q_{g,n} (from memory; the KdV
       route below recomputes every correlator independently) */
    UNIT_CHECK(&rep, vol_is(&dvv, 1, 1, 2, 3), "Vol Q_{1,1} = 2 pi^2/3");
    UNIT_CHECK(&rep, vol_is(&dvv, 1, 2, 1, 3), "Vol Q_{1,2} = pi^4/3");
    UNIT_CHECK(&rep, vol_is(&dvv, 1, 3, 11, 60), "Vol Q_{1,3} = 11 pi^6/60");
    UNIT_CHECK(&rep, vol_is(&dvv, 2, 0, 1, 15), "Vol Q_{2,0} = pi^6/15");
    UNIT_CHECK(&rep, vol_is(&dvv, 2, 1, 29, 840), "Vol Q_{2,1} = 29 pi^8/840");
    UNIT_CHECK(&rep, vol_is(&dvv, 2, 2, 337, 18144), "Vol Q_{2,2} = 337 pi^10/18144");
    UNIT_CHECK(&rep, vol_is(&dvv, 3, 0, 115, 33264), "Vol Q_{3,0} = 115 pi^12/33264");

    /* the two correlator routes give the same volumes for every 3g-3+n <= 7 (genus 0: n <= 8) */
    for (int g = 0; g <= 3; g++)
        for (int n = 0; 3 * g - 3 + n <= 7; n++) {
            fmpq_t a, b;
            if (2 * g - 2 + n <= 0 || 3 * g - 3 + n < 1 || sg_estimate_count(g, n) > 1e5)
                continue;
            fmpq_init(a);
            fmpq_init(b);
            int ra = mv_volume(a, g, n, &dvv, 0, NULL), rb = mv_volume(b, g, n, &kdv, 0, NULL);
            UNIT_CHECK(&rep, ra == SG_OK && rb == SG_OK && fmpq_equal(a, b) && !fmpq_is_zero(a),
                       "Vol Q_{%d,%d}: DVV and KdV routes", g, n);
            fmpq_clear(a);
            fmpq_clear(b);
        }

    /* Shapes against labelled graphs (property tests of sgraph_shape.c): for every (g, n) whose
       labelled graphs number at most about 1e5, the groupoid weights of the shapes with k edges
       add up to sum 1/|Aut Gamma| over the labelled graphs with k edges, and the two volume sums
       are equal (with DVV correlators for the shapes, KdV ones for the labelled graphs). */
    for (int g = 0; g <= 4; g++)
        for (int n = 0; 3 * g - 3 + n <= 9 && n <= SG_SHAPE_MAX_LEGS; n++) {
            if (2 * g - 2 + n <= 0 || 3 * g - 3 + n < 1 || sg_estimate_count(g, n) > 1e5)
                continue;
            sg_list A, B;
            fmpq_t wa, wb, x, va, vb;
            fmpz_t aut;
            int dim = 3 * g - 3 + n, good = 1;
            sg_list_init(&A), sg_list_init(&B);
            fmpq_init(wa), fmpq_init(wb), fmpq_init(x), fmpq_init(va), fmpq_init(vb), fmpz_init(aut);
            good &= sg_enumerate(&A, g, n, -1, 0, NULL) == SG_OK;
            good &= sg_enumerate_shapes(&B, g, n, 0, NULL) == SG_OK;
            for (int k = 0; k <= dim; k++) {
                fmpq_zero(wa), fmpq_zero(wb);
                for (slong i = 0; i < A.len; i++)
                    if (A.gr[i].ne == k) {
                        sgraph_aut(aut, &A.gr[i]);
                        fmpq_set_fmpz_frac(x, (fmpz[]){1}, aut);
                        fmpq_add(wa, wa, x);
                    }
                for (slong i = 0; i < B.len; i++)
                    if (B.gr[i].ne == k) {
                        sg_shape_weight(x, &B.gr[i]);
                        fmpq_add(wb, wb, x);
                    }
                good &= fmpq_equal(wa, wb) && !fmpq_is_zero(wa);
            }
            good &= mv_volume(va, g, n, &kdv, 0, NULL) == SG_OK;
            good &= mv_volume_by_shapes(vb, g, n, &dvv, 0, NULL) == SG_OK;
            UNIT_CHECK(&rep, good && fmpq_equal(va, vb) && B.len <= A.len,
                       "Mbar_{%d,%d}: shapes against labelled graphs (%ld shapes, %ld graphs)", g, n, (long) B.len,
                       (long) A.len);
            sg_list_clear(&A), sg_list_clear(&B);
            fmpq_clear(wa), fmpq_clear(wb), fmpq_clear(x), fmpq_clear(va), fmpq_clear(vb), fmpz_clear(aut);
        }
    {   /* with no legs a shape is a graph: Mbar_2 has 7 stable graphs, Mbar_3 42 (test_sgraph.c) */
        sg_list L;
        sg_list_init(&L);
        sg_enumerate_shapes(&L, 2, 0, 0, NULL);
        UNIT_CHECK(&rep, L.len == 7, "7 shapes of Mbar_2 (got %ld)", (long) L.len);
        sg_list_clear(&L);
        sg_list_init(&L);
        sg_enumerate_shapes(&L, 3, 0, 0, NULL);
        UNIT_CHECK(&rep, L.len == 42, "42 shapes of Mbar_3 (got %ld)", (long) L.len);
        sg_list_clear(&L);
        sg_list_init(&L);
        UNIT_CHECK(&rep, sg_enumerate_shapes(&L, 0, 16, 0, NULL) == SG_BADARG, "16 legs are beyond the shapes");
        sg_list_clear(&L);
    }

    /* Genus two, simple closed geodesics: the non-separating one (a loop at a genus-1 vertex)
       is 48 times as frequent as the separating one (two genus-1 vertices), as DGZZ state.  By
       hand: Z(b N_{1,2}(b,b)) = Z(b^5/96) = 120 zeta(6)/96 with 1/|Aut| = 1/2, against
       Z(b N_{1,1}(b)^2) = 120 zeta(6)/2304 with 1/2^{|V|-1} = 1/2 and 1/|Aut| = 1/2:
       Vol = 16 pi^6/945 and pi^6/2835 with c_{2,0} = 128/5. */
    {
        sg_list L;
        fmpq_t v, p, nonsep, sep, r, pn, ps;
        sg_list_init(&L);
        fmpq_init(v), fmpq_init(p), fmpq_init(nonsep), fmpq_init(sep), fmpq_init(r), fmpq_init(pn), fmpq_init(ps);
        sg_enumerate(&L, 2, 0, 1, 0, NULL);
        UNIT_CHECK(&rep, L.len == 2, "two one-edge graphs in genus 2");
        for (slong i = 0; i < L.len; i++) {
            mv_graph(v, p, &L.gr[i], &dvv);
            fmpq_set(L.gr[i].nv == 1 ? nonsep : sep, v);
            fmpq_set(L.gr[i].nv == 1 ? pn : ps, p);
        }
        fmpq_set_si(r, 16, 945);
        UNIT_CHECK(&rep, fmpq_equal(nonsep, r), "Vol(non-separating) = 16 pi^6/945");
        fmpq_set_si(r, 1, 2835);
        UNIT_CHECK(&rep, fmpq_equal(sep, r), "Vol(separating) = pi^6/2835");
        fmpq_div(r, nonsep, sep);
        UNIT_CHECK(&rep, fmpq_equal_si(r, 48), "frequency ratio 48");
        fmpq_div(r, pn, ps);   /* the primitive parts: zeta(6) cancels between the two */
        UNIT_CHECK(&rep, fmpq_equal_si(r, 48), "primitive frequency ratio 48");
        sg_list_clear(&L);
        fmpq_clear(v), fmpq_clear(p), fmpq_clear(nonsep), fmpq_clear(sep), fmpq_clear(r), fmpq_clear(pn), fmpq_clear(ps);
    }
    /* The counting polynomials (Weil-Petersson volumes of the cut surface by the pushforward)
       against the primitive parts (DVV correlators in N_{g,n}): both are Y of the top-degree
       parts, so prim / (leading coefficient) = c_{g,n} 2^{3-2g-n} (6g-6+2n)! for every graph
       (property test; the powers of 2 of N_{g,n} and of V^top cancel up to 2^{|V|}, which
       1/2^{|V|-1} takes back). */
    for (int g = 0; g <= 3; g++)
        for (int n = 0; 3 * g - 3 + n <= 6; n++) {
            sg_list L;
            int dim = 3 * g - 3 + n;
            if (2 * g - 2 + n <= 0 || dim < 1 || sg_estimate_count(g, n) > 2e4)
                continue;
            fmpq *coef = _fmpq_vec_init(dim + 1);
            fmpq_t prim, want, r;
            fmpz_t f;
            fmpq_init(prim), fmpq_init(want), fmpq_init(r), fmpz_init(f);
            fmpz_fac_ui(f, (ulong) (4 * g - 4 + n));            /* c_{g,n} 2^{3-2g-n} (6g-6+2n)! */
            fmpz_mul_2exp(f, f, (ulong) (6 * g - 5 + 2 * n + 3 - 2 * g - n));
            fmpq_set_fmpz_frac(want, f, (fmpz[]){1});
            fmpz_fac_ui(f, (ulong) (6 * g - 7 + 2 * n));
            fmpq_div_fmpz(want, want, f);
            fmpz_fac_ui(f, (ulong) (6 * g - 6 + 2 * n));
            fmpq_mul_fmpz(want, want, f);
            sg_list_init(&L);
            sg_enumerate(&L, g, n, -1, 0, NULL);
            int good = 1;
            for (slong i = 0; i < L.len; i++) {
                if (L.gr[i].ne == 0)
                    continue;
                mv_graph(NULL, prim, &L.gr[i], &dvv);
                mc_count_poly(coef, &L.gr[i], T);
                fmpq_div(r, prim, coef + 0);
                good &= fmpq_equal(r, want);
            }
            UNIT_CHECK(&rep, good && L.len > 1, "Mbar_{%d,%d}: counting polynomials against primitive parts", g, n);
            sg_list_clear(&L);
            _fmpq_vec_clear(coef, dim + 1);
            fmpq_clear(prim), fmpq_clear(want), fmpq_clear(r), fmpz_clear(f);
        }

    /* Genus two, non-separating curve: (1/2) int_0^L x V_{1,2}(x, x) dx with Mirzakhani's
       V_{1,2}(a, b) = (4pi^2 + a^2 + b^2)(12pi^2 + a^2 + b^2)/192 (Invent. Math. 2007 table;
       from memory) is (L^6 + 12 pi^2 L^4 + 36 pi^4 L^2)/576 (by hand) */
    {
        sg_list L;
        fmpq coef[4];
        static const long num[4] = {1, 12, 36, 0};
        sg_list_init(&L);
        sg_enumerate(&L, 2, 0, 1, 0, NULL);
        for (int j = 0; j < 4; j++)
            fmpq_init(coef + j);
        for (slong i = 0; i < L.len; i++)
            if (L.gr[i].nv == 1) {
                mc_count_poly(coef, &L.gr[i], T);
                for (int j = 0; j < 4; j++) {
                    fmpq_t w;
                    fmpq_init(w);
                    fmpq_set_si(w, num[j], 576);
                    UNIT_CHECK(&rep, fmpq_equal(coef + j, w), "genus 2 non-separating count, pi^%d", 2 * j);
                    fmpq_clear(w);
                }
            }
        for (int j = 0; j < 4; j++)
            fmpq_clear(coef + j);
        sg_list_clear(&L);
    }
    wk_table_free(T);
    wk_kdv_table_free(K);
    return unit_finish("test_mvvol", &rep);
}
