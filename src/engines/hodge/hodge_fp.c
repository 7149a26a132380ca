/* hodge_fp.c - Hodge integrals by the operator of Faber-Pandharipande (second route).
 *
 * C. Faber, R. Pandharipande, "Hodge integrals and Gromov-Witten theory", Invent. Math. 139
 * (2000) 173-199, section 2: with F(t, s) = sum_g hbar^{2g-2} sum_n 1/n! sum_d
 * <tau_{d_1}..tau_{d_n} exp(sum_l s_{2l-1} ch_{2l-1})>_g t_{d_1}..t_{d_n} and Z = exp F,
 *     Z(t, s) = exp(sum_{l>=1} B_{2l}/(2l)! s_{2l-1} D_l) Z(t, 0),
 *     D_l = d/dt_{2l} - sum_{i>=0} t_i d/dt_{i+2l-1} + hbar^2/2 sum_{i=0}^{2l-2} (-1)^i d^2/dt_i dt_{2l-2-i}.
 * The D_l commute and do not depend on s, so d Z/d s_{2l-1} = B_{2l}/(2l)! D_l Z, i.e. for F
 *     dF/ds_{2l-1} = B_{2l}/(2l)! [ F_{t_{2l}} - sum_i t_i F_{t_{i+2l-1}}
 *                    + hbar^2/2 sum_i (-1)^i (F_{t_i t_{2l-2-i}} + F_{t_i} F_{t_{2l-2-i}}) ].
 * Taking the coefficient of t_{d_1}..t_{d_n} s^m/m! gives, for a correlator with the multiset
 * C + {ch_{2l-1}} of ch factors, with c_l = B_{2l}/(2l)!,
 *     <tau_d | C + ch_{2l-1}>_g = c_l [ <tau_{2l} tau_d | C>_g - sum_i <tau_{d + (2l-1) e_i} | C>_g
 *        + 1/2 sum_a (-1)^a <tau_a tau_{2l-2-a} tau_d | C>_{g-1}
 *        + 1/2 sum_a (-1)^a sum <tau_a tau_{d_I} | C_1>_{g_1} <tau_{2l-2-a} tau_{d_J} | C_2>_{g_2} ],
 * the last sum over ordered splittings g_1 + g_2 = g, I + J = {1..n}, and distributions of the
 * (labelled) factors of C, unstable correlators counted as zero.  The string and dilaton
 * equations hold with ch factors (E is pulled back along the forgetful map), which removes
 * psi exponents 0 and 1 first.  Kappa classes are traded for points first:
 *     int_{g,n} X kappa_a prod_b kappa_b = int_{g,n+1} X psi_{n+1}^{a+1} prod_b (kappa_b - psi_{n+1}^b)
 * (Arbarello-Cornalba kappa, pi^* kappa_b = kappa_b - psi_{n+1}^b).
 * The class lambda_g may be kept whole instead of expanded into ch classes (the state carries a
 * flag; hodge_fp_internal.h): it is pulled back along forgetful maps, restricts to 0 on the
 * irreducible boundary and to lambda_{g_1} lambda_{g_2} on a separating one, so the operator's
 * terms carry it along, and with no ch factor left the lambda_g formula gives the value.  The
 * separating sum is in hodge_fp_split.c.  No code is shared with hodge_grr.c.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include "hodge_fp_internal.h"

/* The value of the states that vanish (unstable, wrong degree, E = 0, ch_{2k} = 0). */
static const fmpq fp_zero = {0, 1};

/* Keys and sorted copies up to this length live on the stack (one malloc per call cost more
   than the memo lookup). */
#define FP_STACK 64

void hodge_fp_sum_init(hodge_fp_sum *S)
{
    fmpz_init(S->num);
    fmpz_init_set_ui(S->den, 1);
    fmpz_init(S->p);
    fmpz_init(S->q);
    fmpz_init(S->x);
    fmpz_init(S->y);
    fmpz_init(S->w);
    fmpz_init(S->b);
}

void hodge_fp_sum_clear(hodge_fp_sum *S)
{
    fmpz_clear(S->num);
    fmpz_clear(S->den);
    fmpz_clear(S->p);
    fmpz_clear(S->q);
    fmpz_clear(S->x);
    fmpz_clear(S->y);
    fmpz_clear(S->w);
    fmpz_clear(S->b);
}

/* num/den += p/q, den growing to lcm(den, q) when q does not divide it. */
void hodge_fp_sum_add_term(hodge_fp_sum *S)
{
    if (fmpz_equal(S->q, S->den)) {
        fmpz_add(S->num, S->num, S->p);
        return;
    }
    if (!fmpz_divisible(S->den, S->q)) {
        fmpz_gcd(S->y, S->den, S->q);
        fmpz_divexact(S->x, S->q, S->y);
        fmpz_mul(S->num, S->num, S->x);
        fmpz_mul(S->den, S->den, S->x);
    }
    fmpz_divexact(S->x, S->den, S->q);
    fmpz_addmul(S->num, S->p, S->x);
}

/* res = num/den in canonical form. */
static void fp_sum_get(fmpq_t res, const hodge_fp_sum *S)
{
    fmpq_set_fmpz_frac(res, S->num, S->den);
}

/* sum += (num/den) * (g, e, cm, lambda_g if top) (den > 0); returns the status of the correlator. */
static int fp_addmul(hodge_fp_sum *S, hodge_ctx *H, slong num, slong den, slong g, const slong *e, slong n,
                     const slong *cm, slong cmax, int top)
{
    const fmpq *v;
    slong f;
    int st = hodge_fp_corr(&v, &f, H, g, e, n, cm, cmax, top);
    if (st != WK_OK || fmpq_is_zero(v))
        return st;
    fmpz_mul_si(S->p, fmpq_numref(v), num * f);
    fmpz_mul_si(S->q, fmpq_denref(v), den);
    hodge_fp_sum_add_term(S);
    return st;
}

/* The string equation (d[n-1] = 0) or the dilaton equation (d[n-1] = 1) on sorted d, when
   Mbar_{g,n-1} is stable.  Equal exponents are grouped: each distinct value counts once per leg. */
static int fp_string_dilaton(fmpq_t res, hodge_ctx *H, slong g, slong *d, slong n, const slong *cm, slong cmax,
                             int top)
{
    int st = WK_OK;
    hodge_fp_sum S;
    hodge_fp_sum_init(&S);
    if (d[n - 1] == 1)
        st = fp_addmul(&S, H, 2 * g - 3 + n, 1, g, d, n - 1, cm, cmax, top);
    for (slong j = 0; j < n - 1 && st == WK_OK && d[n - 1] == 0; j++) {
        slong c = 1;
        if (d[j] == 0 || (j > 0 && d[j] == d[j - 1]))
            continue;
        while (j + c < n - 1 && d[j + c] == d[j])
            c++;
        d[j]--;
        st = fp_addmul(&S, H, c, 1, g, d, n - 1, cm, cmax, top);
        d[j]++;
    }
    fp_sum_get(res, &S);
    hodge_fp_sum_clear(&S);
    return st;
}

/* sum += sum_{a=0}^{2l-2} (-1)^a/2 <tau_a tau_{2l-2-a} tau_d | C>_{g-1} (irreducible boundary),
   pairing a with 2l-2-a, which give the same correlator with the same sign. */
static int fp_irreducible(hodge_fp_sum *S, hodge_ctx *H, slong g, const slong *d, slong n, slong *e,
                          const slong *cm, slong cmax, slong l)
{
    int st = WK_OK;
    memcpy(e, d, (size_t) n * sizeof(slong));
    for (slong a = 0; a <= l - 1 && st == WK_OK; a++) {
        slong sign = a % 2 ? -1 : 1;
        e[n] = a, e[n + 1] = 2 * l - 2 - a;
        st = fp_addmul(S, H, sign, a == l - 1 ? 2 : 1, g - 1, e, n + 2, cm, cmax, 0);
    }
    return st;
}

/* res = <tau_d | C + ch_{2l-1}>_g (times lambda_g if top) by the coefficient form of the operator
   (file comment); d sorted, cm holds C + ch_{2l-1} and is restored before returning.  lambda_g
   restricts to 0 on the irreducible divisor (E has a trivial quotient there). */
static int fp_step(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, slong *cm, slong cmax, int top)
{
    slong k = cmax, l = (k + 1) / 2;
    slong *e = malloc((size_t) (n + 2) * sizeof(slong));
    fmpq_t c;
    hodge_fp_sum S;
    int st = WK_OK;
    if (e == NULL)
        return WK_LIMIT;
    fmpq_init(c);
    hodge_fp_sum_init(&S);
    cm[k]--;
    memcpy(e, d, (size_t) n * sizeof(slong));
    e[n] = 2 * l;
    st = fp_addmul(&S, H, 1, 1, g, e, n + 1, cm, cmax, top);
    for (slong i = 0; i < n && st == WK_OK; i++) {
        e[i] += k;
        st = fp_addmul(&S, H, -1, 1, g, e, n, cm, cmax, top);
        e[i] -= k;
    }
    if (st == WK_OK && !top)
        st = fp_irreducible(&S, H, g, d, n, e, cm, cmax, l);
    if (st == WK_OK)
        st = hodge_fp_split(&S, H, g, d, n, cm, cmax, l, top);
    cm[k]++;
    fp_sum_get(res, &S);
    hodge_coef(c, H, l);
    fmpq_mul(res, res, c);
    fmpq_clear(c);
    hodge_fp_sum_clear(&S);
    free(e);
    return st;
}

/* Key of a kappa-free state: g, n, sorted d, cm[1..cmax] (cmax trimmed).  key has room for
   n + cmax + 2 entries; returns its length. */
static slong fp_key(slong *key, slong g, const slong *d, slong n, const slong *cm, slong cmax)
{
    key[0] = g, key[1] = n;
    memcpy(key + 2, d, (size_t) n * sizeof(slong));
    memcpy(key + 2 + n, cm + 1, (size_t) cmax * sizeof(slong));
    return n + cmax + 2;
}

/* Packed key of a state that reaches the memo of hodge_fp_corr (sorted d, no ch_{2k}): g, n,
   cmax + 2^16 top, then d and the odd multiplicities cm[1], cm[3], .. four to a word in 16-bit
   fields; the memo hashes and compares far fewer words than with fp_key.  An entry of 2^16 or more
   (not met in practice) gives the unpacked form, told apart by a negative third word.  key has
   room for n + cmax + 3 entries; returns its length. */
static slong fp_key_packed(slong *key, slong g, const slong *d, slong n, const slong *cm, slong cmax, int top)
{
    slong len = 3, f = 0, head = cmax + ((slong) top << 16);
    ulong w = 0;
    int wide = 0;
    for (slong i = 0; i < n; i++)
        wide |= d[i] >= 0x10000;
    for (slong k = 1; k <= cmax; k += 2)
        wide |= cm[k] >= 0x10000;
    key[0] = g, key[1] = n, key[2] = wide ? -1 - head : head;
    if (wide)
        return 3 + fp_key(key + 3, g, d, n, cm, cmax);
    for (slong i = 0; i < n + (cmax + 1) / 2; i++) {
        w |= (ulong) (i < n ? d[i] : cm[2 * (i - n) + 1]) << (16 * f);
        if (++f == 4)
            key[len++] = (slong) w, w = 0, f = 0;
    }
    if (f > 0)
        key[len++] = (slong) w;
    return len;
}

/* Degree of a state: sum of d plus the ch (or kappa) degrees sum_k k m[k]. */
static slong fp_degree(const slong *d, slong n, const slong *m, slong mmax)
{
    slong s = 0;
    for (slong i = 0; i < n; i++)
        s += d[i];
    for (slong k = 1; k <= mmax; k++)
        s += k * m[k];
    return s;
}

/* res = int_{Mbar_{g,n}} prod psi_i^{d_i} lambda_g = binom(2g-3+n; d) b_g (g >= 1, degree
   matching), the lambda_g formula of C. Faber, R. Pandharipande, "Hodge integrals and
   Gromov-Witten theory", Invent. Math. 139 (2000) (conjectured by Getzler and Pandharipande),
   with sum_g b_g t^{2g} = (t/2)/sin(t/2), i.e. b_g = (1 - 2^{1-2g}) |B_{2g}|/(2g)!. */
static void fp_lambda_top(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n)
{
    fmpz_t f;
    fmpz_init(f);
    hodge_coef(res, H, g);
    fmpq_abs(res, res);
    fmpz_one(f);
    fmpz_mul_2exp(f, f, (ulong) (2 * g - 1));
    fmpq_div_fmpz(res, res, f);
    fmpz_sub_ui(f, f, 1);
    fmpq_mul_fmpz(res, res, f);
    fmpz_fac_ui(f, (ulong) (2 * g - 3 + n));
    fmpq_mul_fmpz(res, res, f);
    for (slong i = 0; i < n; i++) {
        fmpz_fac_ui(f, (ulong) d[i]);
        fmpq_div_fmpz(res, res, f);
    }
    fmpz_clear(f);
}

/* res = the value of a state on sorted d: the psi correlator or the lambda_g formula when no ch
   factor is left, else string/dilaton or the operator. */
static int fp_corr_compute(fmpq_t res, hodge_ctx *H, slong g, slong *d, slong n, slong *cm, slong cmax, int top)
{
    int reduce = n > 0 && d[n - 1] <= 1 && 2 * g - 3 + n > 0;
    if (cmax == 0 && !top)
        return wk_table_correlator(res, H->T, g, d, n);     /* kept here: the table's lookups cost more */
    if (cmax == 0) {
        fp_lambda_top(res, H, g, d, n);
        return WK_OK;
    }
    return reduce ? fp_string_dilaton(res, H, g, d, n, cm, cmax, top) : fp_step(res, H, g, d, n, cm, cmax, top);
}

/* *val = the memoised value of the state (sorted d), computed and stored on a miss.  States
   with psi exponents 0 or 1 are memoised too: their string and dilaton expansions branch over
   the points and met the same states again and again. */
static int fp_corr_memo(const fmpq **val, hodge_ctx *H, slong g, slong *d, slong n, slong *cm, slong cmax, int top)
{
    slong *key, small[FP_STACK];
    slong klen;
    fmpq_t res;
    int st;
    key = 2 * (n + cmax + 3) <= FP_STACK ? small : malloc((size_t) (2 * (n + cmax + 3)) * sizeof(slong));
    if (key == NULL)
        return WK_LIMIT;
    klen = fp_key_packed(key, g, d, n, cm, cmax, top);
    *val = keymap_get(&H->memo[HODGE_ROUTE_FP], key, klen);
    st = *val != NULL ? WK_OK : hodge_poll(H, HODGE_ROUTE_FP);
    if (*val == NULL && st == WK_OK) {
        fmpq_init(res);
        st = fp_corr_compute(res, H, g, d, n, cm, cmax, top);
        if (st == WK_OK && H->limit > 0 && H->memo[HODGE_ROUTE_FP].len >= H->limit)
            st = WK_LIMIT;              /* states finished during the recursion count too */
        if (st == WK_OK)
            *val = keymap_set(&H->memo[HODGE_ROUTE_FP], key, klen, res);
        fmpq_clear(res);
    }
    if (key != small)
        free(key);
    return st;
}

/* Removes the psi exponents 1 of sorted d[0..*n-1] by the dilaton equation
   <tau_1 tau_d | C>_{g,n+1} = (2g-2+n) <tau_d | C>_{g,n} (the Hodge classes are pulled back), as
   long as the space stays stable and the factor below 2^31; returns the product of the factors.
   Those states then never reach the memo: their lookups become lookups of the smaller state. */
static slong fp_strip_dilaton(slong *d, slong *n, slong g)
{
    slong f = 1, i = *n, ones = 0;
    while (i > 0 && d[i - 1] == 0)
        i--;
    while (i - ones > 0 && d[i - ones - 1] == 1 && 2 * g - 3 + (*n - ones) > 0
           && f * (2 * g - 3 + (*n - ones)) < ((slong) 1 << 31))
        f *= 2 * g - 3 + (*n - ones), ones++;
    if (ones > 0) {
        memmove(d + i - ones, d + i, (size_t) (*n - i) * sizeof(slong));
        *n -= ones;
    }
    return f;
}

int hodge_fp_corr(const fmpq **val, slong *factor, hodge_ctx *H, slong g, const slong *din, slong n,
                  const slong *cmin, slong cmax, int top)
{
    slong *buf, small[FP_STACK];
    int st;
    *val = &fp_zero;
    *factor = 1;
    top = top && g > 0;                 /* lambda_0 = 1 */
    while (cmax > 0 && cmin[cmax] == 0)
        cmax--;
    if (2 * g - 2 + n <= 0 || fp_degree(din, n, cmin, cmax) + (top ? g : 0) != 3 * g - 3 + n)
        return WK_OK;
    if (g == 0 && cmax > 0)
        return WK_OK;                   /* E = 0 in genus 0 */
    for (slong k = 2; k <= cmax; k += 2)
        if (cmin[k] > 0)
            return WK_OK;               /* ch_{2k} = 0 (Mumford) */
    buf = n + cmax + 1 <= FP_STACK ? small : malloc((size_t) (n + cmax + 1) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    memcpy(buf, din, (size_t) n * sizeof(slong));
    memcpy(buf + n, cmin, (size_t) (cmax + 1) * sizeof(slong));
    hodge_sort_desc(buf, n);
    slong n0 = n;
    *factor = fp_strip_dilaton(buf, &n, g);
    st = fp_corr_memo(val, H, g, buf, n, buf + n0, cmax, top);
    if (buf != small)
        free(buf);
    if (st != WK_OK || *val == NULL)
        *val = &fp_zero;
    return st;
}

static int fp_kappa(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, const slong *km, slong kmax,
                    const slong *cm, slong cmax, int top);

/* res += sum over j_b <= km[b] of prod binom(km[b], j_b) (-1)^{j_b} times the state with one
   more point of exponent e0 + sum b j_b and kappa multiplicities km[b] - j_b: the expansion of
   prod_b (kappa_b - psi_{n+1}^b)^{km[b]}.  e has room for n + 1 entries and starts with d. */
static int fp_kappa_pull(fmpq_t res, hodge_ctx *H, slong g, slong *e, slong n, slong e0, const slong *km,
                         slong kmax, const slong *cm, slong cmax, int top)
{
    slong *j = calloc((size_t) (2 * kmax + 2), sizeof(slong)), *rest;
    int st = WK_OK;
    fmpq_t v;
    if (j == NULL)
        return WK_LIMIT;
    rest = j + kmax + 1;
    fmpq_init(v);
    do {
        slong ex = e0, sj = 0;
        fmpz_t w, b;
        fmpz_init_set_ui(w, 1);
        fmpz_init(b);
        for (slong t = 1; t <= kmax; t++) {
            ex += t * j[t], sj += j[t], rest[t] = km[t] - j[t];
            fmpz_bin_uiui(b, (ulong) km[t], (ulong) j[t]);
            fmpz_mul(w, w, b);
        }
        e[n] = ex;
        st = fp_kappa(v, H, g, e, n + 1, rest, kmax, cm, cmax, top);
        fmpq_mul_fmpz(v, v, w);
        (sj % 2 ? fmpq_sub : fmpq_add)(res, res, v);
        fmpz_clear(w);
        fmpz_clear(b);
    } while (st == WK_OK && hodge_counter_next(j + 1, km + 1, kmax));
    fmpq_clear(v);
    free(j);
    return st;
}

/* res = int prod psi^d prod kappa^km prod ch^cm (lambda_g) on Mbar_{g,n}: removes the largest
   kappa index a by int_{g,n} X kappa_a = int_{g,n+1} pi^*X psi_{n+1}^{a+1} (file comment; the
   Hodge classes are pulled back); memoised. */
static int fp_kappa(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, const slong *km, slong kmax,
                    const slong *cm, slong cmax, int top)
{
    slong *buf, klen;
    const fmpq *hit;
    int st;
    fmpq_zero(res);
    while (kmax > 0 && km[kmax] == 0)
        kmax--;
    while (cmax > 0 && cm[cmax] == 0)
        cmax--;
    if (kmax == 0) {
        const fmpq *v;
        slong f;
        int stc = hodge_fp_corr(&v, &f, H, g, d, n, cm, cmax, top);
        fmpq_set(res, v);
        fmpq_mul_si(res, res, f);
        return stc;
    }
    if (fp_degree(d, n, km, kmax) + fp_degree(d, 0, cm, cmax) + (top ? g : 0) != 3 * g - 3 + n)
        return WK_OK;
    buf = malloc((size_t) (2 * n + 2 * kmax + cmax + 8) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    slong *key = buf + n + 1, *km1 = key + n + kmax + cmax + 4;
    memcpy(buf, d, (size_t) n * sizeof(slong));
    hodge_sort_desc(buf, n);
    key[0] = -1 - top, key[1] = kmax;    /* negative: never a key of hodge_fp_corr */
    memcpy(key + 2, km + 1, (size_t) kmax * sizeof(slong));
    klen = 2 + kmax + fp_key(key + 2 + kmax, g, buf, n, cm, cmax);
    hit = keymap_get(&H->memo[HODGE_ROUTE_FP], key, klen);
    if (hit != NULL) {
        fmpq_set(res, hit);
        free(buf);
        return WK_OK;
    }
    memcpy(km1, km, (size_t) (kmax + 1) * sizeof(slong));
    km1[kmax]--;
    st = hodge_poll(H, HODGE_ROUTE_FP);
    if (st == WK_OK)
        st = fp_kappa_pull(res, H, g, buf, n, kmax + 1, km1, kmax, cm, cmax, top);
    if (st == WK_OK)
        keymap_set(&H->memo[HODGE_ROUTE_FP], key, klen, res);
    else
        fmpq_zero(res);
    free(buf);
    return st;
}

int hodge_fp_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n,
                      const slong *km, slong kmax, const slong *cm, slong cmax, int top)
{
    return fp_kappa(res, H, g, d, n, km, kmax, cm, cmax, top && g > 0);
}
