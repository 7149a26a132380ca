/* test_hodge_elsv.c - the ELSV formula: simple Hurwitz numbers from Hodge integrals (both routes of
 * src/engines/hodge/hodge.h) against an independent count through characters of the symmetric group.
 *
 * T. Ekedahl, S. Lando, M. Shapiro, A. Vainshtein, "Hurwitz numbers and intersections on moduli
 * spaces of curves", Invent. Math. 146 (2001) 297-327 (normalisation from memory, confirmed by the
 * brute-force count below): for a partition mu of d with n parts and r = 2g-2+n+d,
 *     H_{g,mu} = r!/|Aut mu| prod_i mu_i^{mu_i}/mu_i! int_{Mbar_{g,n}} (1 - lambda_1 + ... + (-1)^g lambda_g)
 *                / prod_i (1 - mu_i psi_i),
 * H_{g,mu} = (1/d!) #{(t_1, ..., t_r, s) : t_j transpositions, s of cycle type mu, t_1...t_r s = 1,
 * generating a transitive subgroup of S_d} (connected covers of P^1 weighted by 1/|Aut|).
 * Without transitivity, Frobenius' character formula gives (sum over partitions l of d)
 *     H^._{mu,r} = sum_l dim(l) chi_l(mu) f(l)^r / (d! z_mu),   f(l) = sum of the contents of l,
 * with chi_l(mu) by the Murnaghan-Nakayama rule (F. D. Murnaghan, Amer. J. Math. 59 (1937);
 * T. Nakayama, Jap. J. Math. 17 (1941); the counting formula goes back to G. Frobenius, "Ueber
 * Gruppencharaktere", Sitzungsber. Preuss. Akad. Wiss. (1896); both from memory, and the count is
 * confirmed by brute force below).  Connected numbers follow from the exponential
 * formula with labelled parts of mu (h = |Aut mu| H): the component holding the first part.
 * The character side is checked against a brute-force count of transposition tuples for d <= 4.
 */
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include "hodge/hodge.h"
#include "keymap.h"
#include "compositions.h"
#include "unit.h"

#define DMAX 8
#define GMAX 4
#define RMAX (2 * GMAX - 2 + 2 * DMAX)

static unit_report rep;

/* chi of the partition with bead set mask (d beads on 0..2d-1) at the cycle type mu[0..len-1]:
   Murnaghan-Nakayama, removing a rim hook of length mu[0] = moving a bead from b to b - mu[0]
   over an empty position, with sign (-1)^(beads strictly between). */
static slong mn_character(unsigned mask, const slong *mu, slong len)
{
    slong k, total = 0;
    if (len == 0)
        return 1;
    k = mu[0];
    for (slong b = k; b < 2 * DMAX; b++) {
        if (!(mask & (1u << b)) || (mask & (1u << (b - k))))
            continue;
        unsigned between = mask & ((1u << b) - 1) & ~((1u << (b - k + 1)) - 1);
        slong s = __builtin_popcount(between) % 2 ? -1 : 1;
        total += s * mn_character(mask ^ (1u << b) ^ (1u << (b - k)), mu + 1, len - 1);
    }
    return total;
}

/* Bead set of the partition l[0..L-1] (descending) padded to d parts. */
static unsigned beads(const slong *l, slong L, slong d)
{
    unsigned m = 0;
    for (slong i = 0; i < d; i++)
        m |= 1u << ((i < L ? l[i] : 0) + d - 1 - i);
    return m;
}

/* Calls f on every partition of d (descending parts); the array p has room for d parts. */
typedef void (*part_fn)(const slong *p, slong len, void *data);
static void partitions_rec(slong *p, slong len, slong rest, slong maxpart, part_fn f, void *data)
{
    if (rest == 0) {
        f(p, len, data);
        return;
    }
    for (slong k = (rest < maxpart ? rest : maxpart); k >= 1; k--) {
        p[len] = k;
        partitions_rec(p, len + 1, rest - k, k, f, data);
    }
}

/* Disconnected count with labelled parts: h(mu, r) = |Aut mu| sum_l dim chi_l(mu) f^r / (d! z_mu). */
typedef struct {
    const slong *mu;
    slong len, d, r;
    fmpq_t sum;
} frob_data;

static void frob_term(const slong *l, slong L, void *data)
{
    frob_data *F = data;
    slong ones[DMAX], content = 0;
    fmpz_t t;
    for (slong i = 0; i < F->d; i++)
        ones[i] = 1;
    for (slong i = 0; i < L; i++)
        content += l[i] * (l[i] - 1) / 2 - i * l[i];
    unsigned m = beads(l, L, F->d);
    fmpz_init(t);
    fmpz_set_si(t, content);
    fmpz_pow_ui(t, t, (ulong) F->r);
    fmpz_mul_si(t, t, mn_character(m, ones, F->d) * mn_character(m, F->mu, F->len));
    fmpq_add_fmpz(F->sum, F->sum, t);
    fmpz_clear(t);
}

/* Disconnected simple Hurwitz number with labelled parts, h = |Aut mu| H^. = sum / (d! prod mu_i)
   (|Aut mu| / z_mu = 1 / prod mu_i); h(empty, r) = [r = 0]. */
static void hurwitz_disconnected(fmpq_t h, const slong *mu, slong len, slong r)
{
    frob_data F;
    slong p[DMAX], d = 0;
    fmpz_t den;
    for (slong i = 0; i < len; i++)
        d += mu[i];
    if (d == 0) {
        fmpq_set_si(h, r == 0, 1);
        return;
    }
    F.mu = mu, F.len = len, F.d = d, F.r = r;
    fmpq_init(F.sum);
    partitions_rec(p, 0, d, d, frob_term, &F);
    fmpz_init(den);
    fmpz_fac_ui(den, (ulong) d);
    for (slong i = 0; i < len; i++)
        fmpz_mul_si(den, den, mu[i]);
    fmpq_div_fmpz(h, F.sum, den);
    fmpz_clear(den);
    fmpq_clear(F.sum);
}

static keymap connected_memo;

/* Connected count with labelled parts by the exponential formula: h^.(S, r) is the sum over the
   parts T holding S[0] and the branch points r_1 of binom(r, r_1) h(T, r_1) h^.(S - T, r - r_1). */
static void hurwitz_connected(fmpq_t h, const slong *S, slong len, slong r)
{
    slong key[DMAX + 2], T[DMAX], U[DMAX];
    const fmpq *hit;
    fmpq_t a, b;
    fmpz_t bin;
    key[0] = r, key[1] = len;
    memcpy(key + 2, S, (size_t) len * sizeof(slong));
    if ((hit = keymap_get(&connected_memo, key, len + 2)) != NULL) {
        fmpq_set(h, hit);
        return;
    }
    fmpq_init(a);
    fmpq_init(b);
    fmpz_init(bin);
    hurwitz_disconnected(h, S, len, r);
    for (unsigned sub = 0; sub + 1 < (1u << (len - 1)); sub++) {   /* T = {0} + sub, T != S */
        slong nt = 0, nu = 0;
        T[nt++] = S[0];
        for (slong i = 1; i < len; i++) {
            if (sub & (1u << (i - 1)))
                T[nt++] = S[i];
            else
                U[nu++] = S[i];
        }
        for (slong r1 = 0; r1 <= r; r1++) {
            hurwitz_connected(a, T, nt, r1);
            if (fmpq_is_zero(a))
                continue;
            hurwitz_disconnected(b, U, nu, r - r1);
            fmpz_bin_uiui(bin, (ulong) r, (ulong) r1);
            fmpq_mul(a, a, b);
            fmpq_mul_fmpz(a, a, bin);
            fmpq_sub(h, h, a);
        }
    }
    keymap_set(&connected_memo, key, len + 2, h);
    fmpq_clear(a);
    fmpq_clear(b);
    fmpz_clear(bin);
}

/* Transitive-tuple counts by sorted cycle type (padded with zeros) of the product. */
typedef long brute_counts[5][5][5][5];

/* Cycle type of perm[0..d-1], sorted descending into cyc[0..3] (zeros after the last cycle). */
static void cycle_type(const slong *perm, slong d, slong *cyc)
{
    slong seen[4] = {0, 0, 0, 0}, nc = 0;
    for (slong i = 0; i < 4; i++)
        cyc[i] = 0;
    for (slong i = 0; i < d; i++) {
        slong len = 0;
        for (slong x = i; !seen[x]; x = perm[x])
            seen[x] = 1, len++;
        if (len > 0)
            cyc[nc++] = len;
    }
    for (slong i = 1; i < nc; i++)
        for (slong j = i; j > 0 && cyc[j] > cyc[j - 1]; j--) {
            slong t = cyc[j];
            cyc[j] = cyc[j - 1], cyc[j - 1] = t;
        }
}

/* Every tuple of r transpositions of S_d (d <= 4): counts the transitive ones by product type. */
static void brute_count(slong d, slong r, brute_counts count)
{
    slong nt = d * (d - 1) / 2, ta[6], tb[6], idx[6] = {0};
    memset(count, 0, sizeof(brute_counts));
    for (slong a = 0, t = 0; a < d; a++)
        for (slong b = a + 1; b < d; b++, t++)
            ta[t] = a, tb[t] = b;
    if (r > 0 && nt == 0)
        return;
    for (;;) {
        slong perm[4], comp[4], cyc[4], j = 0;
        int transitive = 1;
        for (slong i = 0; i < d; i++)
            perm[i] = i, comp[i] = i;
        for (slong k = 0; k < r; k++) {
            slong x = ta[idx[k]], y = tb[idx[k]], tmp = perm[x], cx = comp[x], cy = comp[y];
            perm[x] = perm[y], perm[y] = tmp;
            for (slong i = 0; i < d; i++)
                comp[i] = comp[i] == cy ? cx : comp[i];
        }
        for (slong i = 0; i < d; i++)
            transitive &= comp[i] == comp[0];
        cycle_type(perm, d, cyc);
        count[cyc[0]][cyc[1]][cyc[2]][cyc[3]] += transitive;
        while (j < r && ++idx[j] == nt)
            idx[j++] = 0;
        if (j == r)
            return;
    }
}

/* h(mu, r) by characters against |Aut mu| / d! times the brute-force count. */
static void brute_compare(const slong *mu, slong len, slong d, slong r, brute_counts count)
{
    slong aut = 1, run = 1, c[4] = {0, 0, 0, 0};
    fmpq_t h, e;
    fmpz_t f;
    for (slong i = 0; i < len; i++)
        c[i] = mu[i];
    for (slong i = 1; i < len; i++)
        aut *= mu[i] == mu[i - 1] ? ++run : (run = 1);
    fmpq_init(h);
    fmpq_init(e);
    fmpz_init(f);
    hurwitz_connected(h, mu, len, r);
    fmpz_fac_ui(f, (ulong) d);
    fmpq_set_si(e, count[c[0]][c[1]][c[2]][c[3]] * aut, 1);
    fmpq_div_fmpz(e, e, f);
    UNIT_CHECK(&rep, fmpq_equal(h, e), "characters vs brute force, d=%ld r=%ld mu_1=%ld n=%ld",
               (long) d, (long) r, (long) mu[0], (long) len);
    fmpq_clear(h);
    fmpq_clear(e);
    fmpz_clear(f);
}

/* Partition callback: compares every r <= 6 for one mu. */
static void brute_partition(const slong *mu, slong len, void *data)
{
    long *checked = data;
    slong d = 0;
    brute_counts count;
    for (slong i = 0; i < len; i++)
        d += mu[i];
    for (slong r = 0; r <= 6; r++) {
        brute_count(d, r, count);
        brute_compare(mu, len, d, r, count);
        (*checked)++;
    }
}

/* Brute force for d <= 4: every tuple of r <= 6 transpositions of S_d, the cycle type of the
   product and whether the tuple acts transitively; h(mu, r) = |Aut mu| / d! times the number of
   transitive tuples of product type mu.  Checks the character side (hurwitz_connected). */
static void test_brute_force(void)
{
    long checked = 0;
    slong p[4];
    for (slong d = 1; d <= 4; d++)
        partitions_rec(p, 0, d, d, brute_partition, &checked);
    printf("connected Hurwitz numbers by characters vs brute force: %ld cases (d <= 4, r <= 6)\n", checked);
}

static keymap hodge_memo;

/* int_{Mbar_{g,n}} psi^a lambda_j by the route, cached by the sorted exponents. */
static int hodge_psi_lambda(fmpq_t v, hodge_ctx *H, int route, slong g, const slong *a, slong n, slong j)
{
    slong key[DMAX + 4], lm[GMAX + 1] = {0};
    const fmpq *hit;
    int st;
    key[0] = route, key[1] = g, key[2] = j;
    memcpy(key + 3, a, (size_t) n * sizeof(slong));
    for (slong i = 4; i < n + 3; i++)                        /* sort the exponents */
        for (slong k = i; k > 3 && key[k] > key[k - 1]; k--) {
            slong t = key[k]; key[k] = key[k - 1]; key[k - 1] = t;
        }
    if ((hit = keymap_get(&hodge_memo, key, n + 3)) != NULL) {
        fmpq_set(v, hit);
        return WK_OK;
    }
    lm[j] = 1;
    st = hodge_integral_lambda(v, H, route, g, a, n, NULL, 0, lm, j, NULL, 0, 0);
    if (st == WK_OK)
        keymap_set(&hodge_memo, key, n + 3, v);
    return st;
}

/* res = r! prod mu_i^{mu_i}/mu_i! sum_j (-1)^j sum_a prod mu_i^{a_i} int psi^a lambda_j, the
   right-hand side of ELSV times |Aut mu|, every composition a of 3g-3+n-j. */
static int elsv_side(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *mu, slong n, slong r)
{
    slong a[DMAX];
    fmpq_t v;
    fmpz_t w, p;
    int st = WK_OK;
    fmpq_init(v);
    fmpz_init(w);
    fmpz_init(p);
    fmpq_zero(res);
    for (slong j = 0; j <= g && st == WK_OK; j++) {
        slong S = 3 * g - 3 + n - j;
        if (S < 0)
            continue;
        for (slong i = 0; i < n; i++)
            a[i] = i == n - 1 ? S : 0;
        do {
            st = hodge_psi_lambda(v, H, route, g, a, n, j);
            fmpz_set_si(w, j % 2 ? -1 : 1);
            for (slong i = 0; i < n; i++) {
                fmpz_set_si(p, mu[i]);
                fmpz_pow_ui(p, p, (ulong) a[i]);
                fmpz_mul(w, w, p);
            }
            fmpq_mul_fmpz(v, v, w);
            fmpq_add(res, res, v);
        } while (st == WK_OK && next_composition(a, n, S));
    }
    fmpz_fac_ui(w, (ulong) r);
    fmpq_mul_fmpz(res, res, w);
    for (slong i = 0; i < n; i++) {
        fmpz_set_si(p, mu[i]);
        fmpz_pow_ui(p, p, (ulong) mu[i]);
        fmpq_mul_fmpz(res, res, p);
        fmpz_fac_ui(p, (ulong) mu[i]);
        fmpq_div_fmpz(res, res, p);
    }
    fmpq_clear(v);
    fmpz_clear(w);
    fmpz_clear(p);
    return st;
}

/* ELSV on every partition mu of d <= DMAX and every genus g <= gmax with Mbar_{g,n} stable. */
typedef struct {
    hodge_ctx *H;
    int route;
    slong gmax;
    long checked, nonzero;
} elsv_data;

static void elsv_check(const slong *mu, slong n, void *data)
{
    elsv_data *E = data;
    slong d = 0;
    for (slong i = 0; i < n; i++)
        d += mu[i];
    for (slong g = 0; g <= E->gmax; g++) {
        slong r = 2 * g - 2 + n + d;
        fmpq_t h, e;
        if (2 * g - 2 + n <= 0)
            continue;
        fmpq_init(h);
        fmpq_init(e);
        hurwitz_connected(h, mu, n, r);
        int st = elsv_side(e, E->H, E->route, g, mu, n, r);
        UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(h, e), "ELSV, route %d, g=%ld d=%ld n=%ld mu_1=%ld",
                   E->route, (long) g, (long) d, (long) n, (long) mu[0]);
        if (!fmpq_equal(h, e)) {
            unit_print_fmpq("characters", h);
            unit_print_fmpq("ELSV", e);
        }
        E->checked++;
        E->nonzero += !fmpq_is_zero(h);
        fmpq_clear(h);
        fmpq_clear(e);
    }
}

static void test_elsv(hodge_ctx *H, int route, slong dmax, slong gmax)
{
    elsv_data E = {H, route, gmax, 0, 0};
    slong p[DMAX];
    for (slong d = 1; d <= dmax; d++)
        partitions_rec(p, 0, d, d, elsv_check, &E);
    printf("ELSV, route %s: %ld Hurwitz numbers (%ld nonzero) agree with characters, d <= %ld, g <= %ld\n",
           route == HODGE_ROUTE_GRR ? "GRR" : "FP", E.checked, E.nonzero, (long) dmax, (long) gmax);
}

int main(void)
{
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    keymap_init(&connected_memo);
    keymap_init(&hodge_memo);
    test_brute_force();
    test_elsv(H, HODGE_ROUTE_FP, DMAX, GMAX);
    test_elsv(H, HODGE_ROUTE_GRR, DMAX, GMAX);
    keymap_clear(&connected_memo);
    keymap_clear(&hodge_memo);
    hodge_free(H);
    wk_table_free(T);
    flint_cleanup();
    return unit_finish("test_hodge_elsv", &rep);
}
