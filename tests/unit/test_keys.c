/* test_keys.c - SHA-256 and the keys of the results store (src/support/sha256.h, src/lang/results_key.h).
 *
 * SHA-256: the three messages of FIPS 180-2 Appendix B ("abc", the 448-bit two-block message,
 * one million 'a') with the digests printed there (NIST, Secure Hash Standard, FIPS PUB 180-2,
 * 2002); messages of lengths around the padding boundary (55, 56, 63, 64, 65 bytes), the empty
 * message and 768 bytes 0..255 repeated, with digests computed by Python's hashlib (an
 * independent implementation); and every message fed in pieces of every size agrees with the
 * one-piece digest (a property test).
 *
 * Keys (property tests): a key depends on every part of the question (space, each index,
 * exponent and coefficient, also deep inside a product 140000 factors long, where the printed
 * form of the class is elided), not on the order in which variables were declared, and is the
 * same for the same question built twice.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "results_key.h"
#include "sha256.h"
#include "unit.h"

static unit_report rep;

static void digest(const void *data, size_t n, size_t piece, char hex[65])
{
    sha256_ctx h;
    sha256_init(&h);
    const unsigned char *p = data;
    for (size_t done = 0; done < n; done += piece)
        sha256_update(&h, p + done, n - done < piece ? n - done : piece);
    sha256_final_hex(&h, hex);
}

static void expect_digest(const void *data, size_t n, const char *want, const char *what)
{
    char hex[65];
    digest(data, n, n ? n : 1, hex);
    UNIT_CHECK(&rep, strcmp(hex, want) == 0, "%s: %s, want %s", what, hex, want);
}

static void test_sha256(void)
{
    expect_digest("abc", 3, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", "FIPS abc");
    const char *two = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";
    expect_digest(two, strlen(two), "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1", "FIPS 448 bits");
    char *million = malloc(1000000);
    memset(million, 'a', 1000000);
    expect_digest(million, 1000000, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0", "FIPS 1e6 a");
    free(million);
    expect_digest("", 0, "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855", "empty (hashlib)");
    static const char *lens[] = {"d5e285683cd4efc02d021a5c62014694958901005d6f71e89e0989fac77e4072",
                                 "04c26261370ee7541549d16dee320c723e3fd14671e66a099afe0a377c16888e",
                                 "75220b47218278e656f2013bb8f0c455a25eaf01e86c64924e9d48d89776d6f2",
                                 "7ce100971f64e7001e8fe5a51973ecdfe1ced42befe7ee8d5fd6219506b5393c",
                                 "9537c5fdf120482f7d58d25e9ed583f52c02b4e304ea814db1633ad565aed7e9"};
    static const size_t n[] = {55, 56, 63, 64, 65};
    char x[65];
    memset(x, 'x', sizeof x);
    for (int i = 0; i < 5; i++)
        expect_digest(x, n[i], lens[i], "x repeated (hashlib)");
    unsigned char bytes[768];
    for (int i = 0; i < 768; i++)
        bytes[i] = (unsigned char)i;
    expect_digest(bytes, 768, "f3a25aa93aa2fbba28d79260535bbd6a5eb0fc1c24a8b0f04e12b484c1dfe363", "0..255 x3 (hashlib)");
    char whole[65], parts[65];
    digest(bytes, 768, 768, whole);
    for (size_t piece = 1; piece <= 130; piece++) {
        digest(bytes, 768, piece, parts);
        UNIT_CHECK(&rep, strcmp(whole, parts) == 0, "pieces of %zu bytes change the digest", piece);
    }
}

/* A product of len factors, factor `at` being c*psi_1*kappa_1^42 and the others 1, built
   left-deep as a loop of multiplications builds it. */
static cx *deep_product(const scalar_ring *R, slong len, slong at, slong c)
{
    fmpq_mpoly_t one;
    fmpq_mpoly_init(one, R->ctx);
    fmpq_mpoly_one(one, R->ctx);
    cx *e = cx_scalar(one, R->ctx);
    for (slong i = 1; i <= len; i++) {
        cx *f;
        if (i == at) {
            fmpq_mpoly_set_si(one, c, R->ctx);
            f = cx_mul(cx_mul(cx_scalar(one, R->ctx), cx_psi(1, R->ctx, NULL)),
                       cx_pow(cx_kappa(1, R->ctx, NULL), 42, NULL));
            fmpq_mpoly_one(one, R->ctx);
        } else {
            f = cx_scalar(one, R->ctx);
        }
        e = cx_mul(e, f);
    }
    fmpq_mpoly_clear(one, R->ctx);
    return e;
}

static void key_of(const scalar_ring *R, slong g, slong n, const cx *e, char hex[65])
{
    if (!results_key_integral(R, g, n, e, hex))
        strcpy(hex, "none");
}

static void test_deep_keys(void)
{
    scalar_ring R;
    scalar_ring_init(&R);
    char k1[65], k2[65], k3[65], k4[65];
    cx *a = deep_product(&R, 140000, 1, 1), *b = deep_product(&R, 140000, 1, 2), *c = deep_product(&R, 140000, 1, 1);
    key_of(&R, 15, 1, a, k1);
    key_of(&R, 15, 1, b, k2);
    key_of(&R, 15, 1, c, k3);
    key_of(&R, 15, 2, a, k4);
    UNIT_CHECK(&rep, strcmp(k1, "none") != 0 && strcmp(k1, k2) != 0, "a coefficient deep inside changes the key");
    UNIT_CHECK(&rep, strcmp(k1, k3) == 0, "the same question built twice has one key");
    UNIT_CHECK(&rep, strcmp(k1, k4) != 0, "the space is part of the key");
    cx_release(b);
    b = deep_product(&R, 140000, 139999, 1);
    key_of(&R, 15, 1, b, k2);
    UNIT_CHECK(&rep, strcmp(k1, k2) != 0, "the position of a factor is part of the key");
    cx_release(a);
    cx_release(b);
    cx_release(c);
    scalar_ring_clear(&R);
}

/* s*psi_1 + t*kappa_2 with s, t declared in the given order. */
static void key_two_vars(int swap, slong kappa, char hex[65])
{
    scalar_ring R;
    scalar_ring_init(&R);
    int s = scalar_ring_declare(&R, swap ? "t" : "s"), t = scalar_ring_declare(&R, swap ? "s" : "t");
    if (swap) {
        int x = s;
        s = t;
        t = x;
    }
    fmpq_mpoly_t vs, vt;
    fmpq_mpoly_init(vs, R.ctx);
    fmpq_mpoly_init(vt, R.ctx);
    scalar_set_gen(vs, &R, s);
    scalar_set_gen(vt, &R, t);
    fmpq_mpoly_add(vs, vs, vt, R.ctx);   /* s + t: two terms, ordered by declaration */
    cx *e = cx_add(cx_mul(cx_scalar(vs, R.ctx), cx_psi(1, R.ctx, NULL)),
                   cx_mul(cx_scalar(vt, R.ctx), cx_kappa(kappa, R.ctx, NULL)));
    key_of(&R, 1, 1, e, hex);
    cx_release(e);
    fmpq_mpoly_clear(vs, R.ctx);
    fmpq_mpoly_clear(vt, R.ctx);
    scalar_ring_clear(&R);
}

static void test_variable_keys(void)
{
    char k1[65], k2[65], k3[65];
    key_two_vars(0, 2, k1);
    key_two_vars(1, 2, k2);
    key_two_vars(0, 3, k3);
    UNIT_CHECK(&rep, strcmp(k1, k2) == 0, "declaration order must not change the key");
    UNIT_CHECK(&rep, strcmp(k1, k3) != 0, "kappa index is part of the key");
    /* kappa_1^2 against kappa_2 and psi_1 against kappa_1: the kinds are distinguished */
    scalar_ring R;
    scalar_ring_init(&R);
    cx *p = cx_pow(cx_kappa(1, R.ctx, NULL), 2, NULL), *q = cx_kappa(2, R.ctx, NULL);
    cx *u = cx_psi(1, R.ctx, NULL), *v = cx_kappa(1, R.ctx, NULL);
    char a[65], b[65], c[65], d[65];
    key_of(&R, 1, 1, p, a);
    key_of(&R, 1, 1, q, b);
    key_of(&R, 1, 1, u, c);
    key_of(&R, 1, 1, v, d);
    UNIT_CHECK(&rep, strcmp(a, b) != 0 && strcmp(c, d) != 0 && strcmp(a, c) != 0, "kinds must be distinguished");
    cx_release(p);
    cx_release(q);
    cx_release(u);
    cx_release(v);
    scalar_ring_clear(&R);
}

int main(void)
{
    test_sha256();
    test_deep_keys();
    test_variable_keys();
    return unit_finish("test_keys", &rep);
}
