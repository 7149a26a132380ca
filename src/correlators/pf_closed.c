/* pf_closed.c - whether a psi-kappa monomial needs the correlator table at all.
 *
 * A kappa monomial whose pushforward expansion has only correlators with a closed form
 * (e.g. int_{Mbar_{g,0}} kappa_{3g-3} = <tau_{3g-2}>_g, or kappa_a kappa_b giving two-point and
 * one-point terms) is answered without any table, so the table's size estimate must not refuse it.
 */
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
