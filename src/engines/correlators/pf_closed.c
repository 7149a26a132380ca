/* pf_closed.c - whether a psi-kappa monomial needs the correlator table at all, and how long its
 * reduction takes when it does.
 *
 * A kappa monomial whose pushforward expansion has only correlators with a closed form
 * (e.g. int_{Mbar_{g,0}} kappa_{3g-3} = <tau_{3g-2}>_g, or kappa_a kappa_b giving two-point and
 * one-point terms) is answered without any table, so the table's size estimate must not refuse it.
 */
#include <math.h>
#include "pushforward.h"

int pf_all_closed(slong g, const slong *d, slong n, const slong *kmult, slong kmax)
{
    pf_expansion E;
    int all = 1;
    if (pf_estimate_terms(kmult, kmax) > PF_CLOSED_MAX_TERMS)
        return 0;
    pf_expansion_init(&E);
    if (pf_expand(&E, g, d, n, kmult, kmax, PF_CLOSED_MAX_TERMS) != WK_OK)
        all = 0;
    for (slong i = 0; all && i < E.len; i++)
        all = wk_closed_form_kind(E.g, E.terms[i].d, E.terms[i].n) != WK_CLOSED_NONE;
    pf_expansion_clear(&E);
    return all;
}

/* Seconds per pushforward term: 6e-5 s at genus <= 8, times 1.35 per genus above.  Fitted to
   bench_engine wp G (int kappa_1^{3G-3} with a fresh table; 2026, this machine): G = 8, 10, 12,
   13, 14 took 0.037, 0.19, 1.4, 4.4 and 10.4 s for 792, 3010, 10143, 17977 and 31185 terms,
   predicted 0.048, 0.33, 2.0, 4.8 and 11 s.  The cost per term grows with the genus because the
   correlators get more points and longer DVV sums; by this fit kappa_1^57 on Mbar_{20,0}
   (614154 terms) takes about 1300 s. */
double pf_estimate_seconds(slong g, double terms)
{
    if (g < 0 || !(terms >= 0) || g > 100000)
        return HUGE_VAL;
    return terms * 6e-5 * pow(1.35, g > 8 ? (double) (g - 8) : 0.0);
}
