/* test_mvvol.c - Masur-Veech volumes by the stable-graph formula: published values, the
 * correlators by two routes (DVV table and the KdV recursion), and the genus-two frequencies of
 * simple closed geodesics.
 */
#include <flint/fmpq.h>

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
    wk_table_free(T);
    wk_kdv_table_free(K);
    return unit_finish("test_mvvol", &rep);
}
