/* test_do_norbury.c - the relations of N. Do and P. Norbury ("Weil-Petersson volumes and cone
 * surfaces", Geom. Dedicata 141 (2009) 93-107, Theorem 2; the form below is quoted from memory and
 * its normalisation is fixed here by the small cases) between the Weil-Petersson volume
 * polynomials, as property tests on every symmetric coefficient of every (g, n) with
 * 1 <= 2g-2+n <= 12:
 *
 *   (string)   V_{g,n+1}(L_1..L_n, 2 pi i) = sum_{k=1..n} int_0^{L_k} L_k V_{g,n}(L) dL_k
 *   (dilaton)  dV_{g,n+1}/dL_{n+1} (L_1..L_n, 2 pi i) = 2 pi i (2g-2+n) V_{g,n}(L)
 *
 * (for n = 0 the first reads V_{g,1}(2 pi i) = 0).  Genus 0 reaches V_{0,15}, genus 2 V_{2,11}.
 *
 * Coefficients.  V_{g,n}(L) is symmetric; with D = 3g-3+n and a sorted multi-index
 * a_1 >= ... >= a_n >= 0, |a| <= D, the coefficient of L_1^{2a_1}...L_n^{2a_n} pi^{2(D-|a|)} is
 *     c_a = 2^m / m! * prod_i 1/(2^{a_i} a_i!) * int psi^a kappa_1^m,   m = D - |a|.
 * At L_{n+1} = 2 pi i, L_{n+1}^{2b} = (-4)^b pi^{2b} and dL^{2b}/dL = 2 pi i 2b (-4)^{b-1} pi^{2b-2},
 * and the powers of pi match term by term, so the relations become, for every sorted a,
 *   (string)   sum_b (-4)^b c_{a+b} = sum_{k: a_k >= 1} c'_{a-e_k} / (2 a_k)          (|a| <= D+1)
 *   (dilaton)  sum_{b >= 1} 2b (-4)^{b-1} c_{a+b} = (2g-2+n) c'_a                        (|a| <= D)
 * with c the coefficients of V_{g,n+1}, c' those of V_{g,n}, a+b the multi-index a with b
 * inserted, a-e_k with a_k lowered by one (both sorted again).
 *
 * Normalisation, by hand (from memory: M. Mirzakhani, "Simple geodesics and Weil-Petersson volumes
 * of moduli spaces of bordered Riemann surfaces", Invent. Math. 167 (2007), table of volume
 * polynomials; each confirmed here against the engine's coefficients):
 *   V_{0,4} = (4 pi^2 + sum L_i^2)/2,   V_{1,1} = (L^2 + 4 pi^2)/48,
 *   V_{1,2} = (4 pi^2 + L_1^2 + L_2^2)(12 pi^2 + L_1^2 + L_2^2)/192.
 * V_{0,4}(L, 2 pi i) = sum L_i^2/2 = sum_k int_0^{L_k} x dx; dV_{0,4}/dL_4 (2 pi i) = 2 pi i V_{0,3}.
 * V_{1,2}(L, 2 pi i) = L^2 (L^2 + 8 pi^2)/192 = int_0^L x V_{1,1}(x) dx; dV_{1,2}/dL_2 (2 pi i)
 * = 4 pi i (8 pi^2 + 2 L^2)/192 = 2 pi i V_{1,1}(L).  So neither relation carries a further factor.
 *
 * Engines.  Every coefficient comes from the pushforward reduction of kappa_1^m to psi
 * correlators (pf_integral, src/engines/correlators/pushforward.c, with the DVV table and its
 * closed forms).  Neither relation is used by that route: it expands kappa_1^m into set
 * partitions and evaluates psi correlators.  (The relations do follow from the psi string and
 * dilaton equations, which the correlator engine uses, together with the pull-back of kappa_1; so
 * this checks the pushforward, the correlators and the normalisation together.)  Where the
 * volume engine applies (g >= 2, n + 1 <= WPOLY_MAX_POINTS: KdV over dual numbers, no string or
 * dilaton step), its coefficients are compared with the reduction's, so those cases are checked
 * by a second, independent route too.
 */
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "volumes/wpoly.h"
#include "unit.h"

#define MAX_EXCESS 12            /* largest 2g-2+n of V_{g,n} */
#define MAX_G (MAX_EXCESS / 2 + 1)
#define MAX_N (MAX_EXCESS + 3)   /* points of V_{g,n+1} */

static unit_report rep;

/* The coefficients of V_{g,n}(L) in the symmetric basis. */
typedef struct {
    slong g, n, D;
    slong len;    /* number of sorted multi-indices */
    slong *idx;   /* len rows of n entries, a_1 >= ... >= a_n >= 0, |a| <= D, lexicographic */
    fmpq *c;      /* c[k]: coefficient of L^{2a} pi^{2(D-|a|)} for the k-th row */
} symvol;

/* Appends to buf (if not NULL) every sorted tail a_pos >= ... >= a_{n-1}, each <= top, with sum
   <= left, in lexicographic order; returns the new row count. */
static slong msets_fill(slong *buf, slong *cur, slong n, slong pos, slong top, slong left,
                        slong count)
{
    slong v;

    if (pos == n)
    {
        if (buf != NULL)
            memcpy(buf + count * n, cur, (size_t) n * sizeof(slong));
        return count + 1;
    }
    for (v = 0; v <= top && v <= left; v++)
    {
        cur[pos] = v;
        count = msets_fill(buf, cur, n, pos + 1, v, left - v, count);
    }
    return count;
}

/* Number of sorted multi-indices of length n and sum <= S; rows into *idx (caller frees). */
static slong msets(slong **idx, slong n, slong S)
{
    slong cur[MAX_N + 1], len = msets_fill(NULL, cur, n, 0, S, S, 0);

    *idx = flint_malloc((size_t) (len * n + 1) * sizeof(slong));
    msets_fill(*idx, cur, n, 0, S, S, 0);
    return len;
}

/* Row of the sorted multi-index a in V, or -1 (then the coefficient is 0: |a| > D). */
static slong symvol_find(const symvol *V, const slong *a)
{
    slong lo = 0, hi = V->len - 1, n = V->n, i;

    while (lo <= hi)
    {
        slong mid = (lo + hi) / 2, cmp = 0;
        const slong *r = V->idx + mid * n;
        for (i = 0; i < n && cmp == 0; i++)
            cmp = (r[i] > a[i]) - (r[i] < a[i]);
        if (cmp == 0)
            return mid;
        if (cmp < 0)
            lo = mid + 1;
        else
            hi = mid - 1;
    }
    return -1;
}

/* c = w 2^m / m! / prod (2^{a_i} a_i!), m = D - |a|: the coefficient of V_{g,n}(L) from
   w = int psi^a kappa_1^m. */
static void coeff_from_integral(fmpq_t c, const fmpq_t w, slong D, const slong *a, slong n)
{
    slong i, s = 0;
    fmpz_t f;

    fmpz_init(f);
    fmpq_set(c, w);
    for (i = 0; i < n; i++)
    {
        s += a[i];
        fmpz_fac_ui(f, (ulong) a[i]);
        fmpq_div_fmpz(c, c, f);
    }
    fmpz_fac_ui(f, (ulong) (D - s));
    fmpq_div_fmpz(c, c, f);
    fmpq_mul_2exp(c, c, (ulong) (D - s));
    fmpq_div_2exp(c, c, (ulong) s);
    fmpz_clear(f);
}

/* Fills V with every coefficient of V_{g,n} by the pushforward reduction (table T); returns
   the number of failed engine calls.  Caller clears V with symvol_clear. */
static slong symvol_by_reduction(symvol *V, wk_table *T, slong g, slong n)
{
    slong k, i, fails = 0;
    fmpq_t w;

    V->g = g;
    V->n = n;
    V->D = 3 * g - 3 + n;
    V->len = msets(&V->idx, n, V->D);
    V->c = _fmpq_vec_init(V->len);
    fmpq_init(w);
    for (k = 0; k < V->len; k++)
    {
        const slong *a = V->idx + k * n;
        slong kmult[2] = { 0, V->D };
        for (i = 0; i < n; i++)
            kmult[1] -= a[i];
        fails += pf_integral(w, T, g, a, n, kmult, kmult[1] > 0 ? 1 : 0) != WK_OK;
        coeff_from_integral(V->c + k, w, V->D, a, n);
    }
    fmpq_clear(w);
    return fails;
}

static void symvol_clear(symvol *V)
{
    _fmpq_vec_clear(V->c, V->len);
    flint_free(V->idx);
}

/* out = the sorted multi-index a (length n) with b inserted (length n + 1). */
static void mset_insert(slong *out, const slong *a, slong n, slong b)
{
    slong i = 0, j = 0;

    while (i < n && a[i] >= b)
        out[j++] = a[i++];
    out[j++] = b;
    while (i < n)
        out[j++] = a[i++];
}

/* out = a with a_k lowered by one, sorted again (a_k >= 1). */
static void mset_lower(slong *out, const slong *a, slong n, slong k)
{
    slong i, t;

    memcpy(out, a, (size_t) n * sizeof(slong));
    out[k]--;
    for (i = k; i + 1 < n && out[i] < out[i + 1]; i++)
    {
        t = out[i];
        out[i] = out[i + 1];
        out[i + 1] = t;
    }
}

/* Adds x * coefficient of Vb at the sorted multi-index a to s (nothing when |a| > D). */
static void add_coeff(fmpq_t s, const symvol *Vb, const slong *a, const fmpq_t x)
{
    slong r = symvol_find(Vb, a);
    fmpq_t t;

    if (r < 0)
        return;
    fmpq_init(t);
    fmpq_mul(t, Vb->c + r, x);
    fmpq_add(s, s, t);
    fmpq_clear(t);
}

/* lhs = sum_b (-4)^b c_{a+b} (dilaton = 0) or sum_{b>=1} 2b (-4)^{b-1} c_{a+b} (dilaton = 1),
   over the coefficients c of Vb = V_{g,n+1}. */
static void at_two_pi_i(fmpq_t lhs, const symvol *Vb, const slong *a, slong n, int dilaton)
{
    slong b, s = 0, i, ab[MAX_N + 1];
    fmpq_t x;

    for (i = 0; i < n; i++)
        s += a[i];
    fmpq_init(x);
    fmpq_zero(lhs);
    for (b = dilaton; s + b <= Vb->D; b++)
    {
        fmpz_set_si(fmpq_numref(x), -4);
        fmpz_pow_ui(fmpq_numref(x), fmpq_numref(x), (ulong) (b - dilaton));
        fmpz_one(fmpq_denref(x));
        if (dilaton)
            fmpq_mul_si(x, x, 2 * b);
        mset_insert(ab, a, n, b);
        add_coeff(lhs, Vb, ab, x);
    }
    fmpq_clear(x);
}

/* Failures of the two relations between Va = V_{g,n} and Vb = V_{g,n+1} over every symmetric
   coefficient: bad[0] (string) of tried[0], bad[1] (dilaton) of tried[1]. */
static void relation_failures(slong bad[2], slong tried[2], const symvol *Va, const symvol *Vb)
{
    slong g = Va->g, n = Va->n, len, k, i, *idx, low[MAX_N + 1];
    fmpq_t lhs, rhs, x;

    fmpq_init(lhs);
    fmpq_init(rhs);
    fmpq_init(x);
    bad[0] = bad[1] = tried[1] = 0;
    tried[0] = len = msets(&idx, n, Va->D + 1);
    for (k = 0; k < len; k++)
    {
        const slong *a = idx + k * n;
        slong r = symvol_find(Va, a);
        at_two_pi_i(lhs, Vb, a, n, 0);
        fmpq_zero(rhs);
        for (i = 0; i < n; i++)
            if (a[i] >= 1)
            {
                fmpq_set_si(x, 1, (ulong) (2 * a[i]));
                mset_lower(low, a, n, i);
                add_coeff(rhs, Va, low, x);
            }
        bad[0] += !fmpq_equal(lhs, rhs);
        if (r < 0)
            continue;
        at_two_pi_i(lhs, Vb, a, n, 1);
        fmpq_mul_si(rhs, Va->c + r, 2 * g - 2 + n);
        bad[1] += !fmpq_equal(lhs, rhs);
        tried[1]++;
    }
    flint_free(idx);
    fmpq_clear(lhs);
    fmpq_clear(rhs);
    fmpq_clear(x);
}

/* Both relations for (g, n), reported; adds the identities checked to *count. */
static void check_relations(const symvol *Va, const symvol *Vb, slong *count)
{
    slong bad[2], tried[2], g = Va->g, n = Va->n;

    relation_failures(bad, tried, Va, Vb);
    UNIT_CHECK(&rep, bad[0] == 0, "V_{%ld,%ld}(L, 2 pi i) = sum_k int_0^{L_k} L_k V_{%ld,%ld} dL_k: "
               "%ld of %ld symmetric coefficients differ (Do-Norbury 2009, property)",
               g, n + 1, g, n, bad[0], tried[0]);
    UNIT_CHECK(&rep, bad[1] == 0, "dV_{%ld,%ld}/dL_%ld (L, 2 pi i) = 2 pi i (2g-2+n) V_{%ld,%ld}: "
               "%ld of %ld symmetric coefficients differ (Do-Norbury 2009, property)",
               g, n + 1, n + 1, g, n, bad[1], tried[1]);
    *count += tried[0] + tried[1];
}

/* Control: the check is not vacuous.  Changing one coefficient of V_{g,n+1} (the constant term,
   which both relations read) makes both fail. */
static void check_control(symvol *Va, symvol *Vb)
{
    slong bad[2], tried[2], zero[MAX_N + 1] = { 0 }, r = symvol_find(Vb, zero);
    fmpq_t keep;

    fmpq_init(keep);
    fmpq_set(keep, Vb->c + r);
    fmpq_add_si(Vb->c + r, Vb->c + r, 1);
    relation_failures(bad, tried, Va, Vb);
    UNIT_CHECK(&rep, bad[0] >= 1, "control (%ld,%ld): a changed constant term breaks the string "
               "relation", Vb->g, Vb->n);
    fmpq_set(Vb->c + r, keep);
    zero[0] = 1;
    r = symvol_find(Vb, zero);
    fmpq_set(keep, Vb->c + r);
    fmpq_add_si(Vb->c + r, Vb->c + r, 1);
    relation_failures(bad, tried, Va, Vb);
    UNIT_CHECK(&rep, bad[1] >= 1, "control (%ld,%ld): a changed L_%ld^2 coefficient breaks the "
               "dilaton relation", Vb->g, Vb->n, Vb->n);
    fmpq_set(Vb->c + r, keep);
    fmpq_clear(keep);
}

/* The small polynomials of the header (Mirzakhani 2007, from memory), coefficient by
   coefficient against the reduction (the second route); a zero entry beyond the degree must be
   absent from the table. */
static void check_small_cases(wk_table *T)
{
    static const struct { slong g, n, a[2], num, den; } known[] = {
        { 0, 4, { 0, 0 }, 2, 1 }, { 0, 4, { 1, 0 }, 1, 2 }, { 0, 4, { 1, 1 }, 0, 1 },
        { 0, 4, { 2, 0 }, 0, 1 },
        { 1, 1, { 0, 0 }, 1, 12 }, { 1, 1, { 1, 0 }, 1, 48 },
        { 1, 2, { 0, 0 }, 1, 4 }, { 1, 2, { 1, 0 }, 1, 12 }, { 1, 2, { 2, 0 }, 1, 192 },
        { 1, 2, { 1, 1 }, 1, 96 },
    };
    size_t i;

    for (i = 0; i < sizeof known / sizeof known[0]; i++)
    {
        symvol V;
        slong a[4] = { 0, 0, 0, 0 }, r;
        fmpq_t q;
        fmpq_init(q);
        fmpq_set_si(q, known[i].num, (ulong) known[i].den);
        a[0] = known[i].a[0];
        a[1] = known[i].a[1];
        UNIT_CHECK(&rep, symvol_by_reduction(&V, T, known[i].g, known[i].n) == 0,
                   "V_{%ld,%ld} by the reduction", known[i].g, known[i].n);
        r = symvol_find(&V, a);
        UNIT_CHECK(&rep, r >= 0 ? fmpq_equal(V.c + r, q) : fmpq_is_zero(q), "V_{%ld,%ld}: coefficient of "
                   "L^(%ld,%ld,..) is %ld/%ld (Mirzakhani 2007, from memory)", known[i].g,
                   known[i].n, a[0], a[1], known[i].num, known[i].den);
        fmpq_clear(q);
        symvol_clear(&V);
    }
}

/* Where the volume engine applies (g >= 2, 1 <= n <= WPOLY_MAX_POINTS), its coefficients equal
   the reduction's (an independent route for those cases). */
static void check_volume_engine(const symvol *V, slong *count)
{
    slong g = V->g, n = V->n, nidx, *idx, k, bad = 0;
    fmpq *w;
    fmpq_t c;
    fmpz_t f;
    int st;

    if (g < 2 || n < 1 || n > WPOLY_MAX_POINTS)
        return;
    nidx = wpoly_indices(NULL, g, n);
    idx = flint_malloc((size_t) (nidx * n) * sizeof(slong));
    wpoly_indices(idx, g, n);
    w = _fmpq_vec_init(nidx);
    st = wpoly_coeffs(w, g, n, 1);
    UNIT_CHECK(&rep, st == WPVOL_OK && nidx == V->len, "volume engine on (%ld,%ld): status %d, "
               "%ld indices", g, n, st, nidx);
    fmpq_init(c);
    fmpz_init(f);
    for (k = 0; k < nidx && k < V->len; k++)
    {
        slong i, m = V->D;
        for (i = 0; i < n; i++)
            m -= idx[k * n + i];
        fmpz_fac_ui(f, (ulong) m);          /* the engine's W_a already holds 1/m! */
        fmpq_mul_fmpz(c, w + k, f);
        coeff_from_integral(c, c, V->D, idx + k * n, n);
        bad += memcmp(idx + k * n, V->idx + k * n, (size_t) n * sizeof(slong)) != 0
               || !fmpq_equal(c, V->c + k);
    }
    UNIT_CHECK(&rep, bad == 0, "V_{%ld,%ld}: %ld of %ld coefficients of the volume engine differ "
               "from the reduction", g, n, bad, nidx);
    *count += nidx;
    fmpz_clear(f);
    fmpq_clear(c);
    _fmpq_vec_clear(w, nidx);
    flint_free(idx);
}

/* Every (g, n) with 1 <= 2g-2+n <= MAX_EXCESS: V_{g,n} and V_{g,n+1} by the reduction (each
   table computed once and kept for the next n), both relations on every coefficient. */
static void check_all(wk_table *T)
{
    slong g, n, count = 0, pairs = 0, engine_count = 0;

    for (g = 0; g <= MAX_G; g++)
    {
        slong n0 = g == 0 ? 3 : (g == 1 ? 1 : 0);
        symvol Va, Vb;
        if (2 * g - 2 + n0 > MAX_EXCESS)
            break;
        UNIT_CHECK(&rep, symvol_by_reduction(&Va, T, g, n0) == 0, "V_{%ld,%ld} by the reduction",
                   g, n0);
        check_volume_engine(&Va, &engine_count);
        for (n = n0; 2 * g - 2 + n <= MAX_EXCESS; n++)
        {
            UNIT_CHECK(&rep, symvol_by_reduction(&Vb, T, g, n + 1) == 0, "V_{%ld,%ld} by the "
                       "reduction", g, n + 1);
            check_volume_engine(&Vb, &engine_count);
            check_relations(&Va, &Vb, &count);
            if (2 * g - 2 + n == MAX_EXCESS && (g == 0 || g == MAX_G - 1))
                check_control(&Va, &Vb);
            pairs++;
            symvol_clear(&Va);
            Va = Vb;
        }
        symvol_clear(&Va);
    }
    printf("Do-Norbury relations: %ld cases (g, n), %ld coefficient identities; %ld coefficients "
           "also by the volume engine\n", pairs, count, engine_count);
    /* n runs over 3..14, 1..12, 0..10, 0..8, 0..6, 0..4, 0..2, 0 for g = 0..7 */
    UNIT_CHECK(&rep, pairs == 12 + 12 + 11 + 9 + 7 + 5 + 3 + 1, "%ld cases (g, n)", pairs);
}

int main(void)
{
    wk_table *T = wk_table_new();

    check_small_cases(T);
    check_all(T);
    wk_table_free(T);
    flint_cleanup_master();
    return unit_finish("test_do_norbury", &rep);
}
