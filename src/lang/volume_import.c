/* Tables of V_{g,n} computed elsewhere (psikappa-volumes-mpi on a cluster) brought into the
   results store, so that scripts read them as they read the tables this program computed.
   The store is a cache of this engine's answers, so a file is taken only when every line reads
   as the driver writes it and every value agrees with the engine modulo one more prime, of the
   engine's form but below any the driver uses: that catches a file edited or cut short, and a
   table of another engine, at the cost of one prime of the run that made it. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/nmod.h>
#include <flint/nmod_vec.h>
#include <flint/ulong_extras.h>

#include "volume_table_store.h"
#include "volumes/wpvol.h"
#include "util.h"

/* Largest genus and number of points a file may claim (far beyond any run). */
#define IMPORT_MAX_G 100000
#define IMPORT_MAX_N 10000

typedef struct {
    const char *path;
    slong G, N;        /* from the last line and the largest n */
    fmpq *t;           /* (G+1)(N+1) values, 0 for the unstable ones; owned */
    slong *line;       /* line of entry g*(N+1)+n, 0 for the unstable ones; owned */
} import_table;

static int import_fail(const import_table *T, long line, const char *msg)
{
    if (line > 0)
        fprintf(stderr, "psikappa: %s:%ld: error: %s: nothing imported\n", T->path, line, msg);
    else
        fprintf(stderr, "psikappa: %s: error: %s: nothing imported\n", T->path, msg);
    return 1;
}

/* One line "g n value": 1 with the parts, 0 if it does not read so. The value must be a
   fraction in lowest terms (or an integer). */
static int import_parse_line(char *s, slong *g, slong *n, fmpq_t v)
{
    long a, b;
    int used = 0;
    s[strcspn(s, "\r\n")] = '\0';
    if (sscanf(s, "%ld %ld %n", &a, &b, &used) != 2 || used == 0 || a < 0 || b < 0)
        return 0;
    const char *val = s + used;
    if (strspn(val, "0123456789/-") != strlen(val) || !*val || fmpq_set_str(v, val, 10) != 0)
        return 0;
    if (!fmpq_is_canonical(v))
        return 0;
    *g = a;
    *n = b;
    return 1;
}

/* The stable (g, n) after (g, n) in a table of at most N points per genus (from (0, -1): the
   first one). */
static void import_next(slong *g, slong *n, slong N)
{
    do {
        if (++*n > N) {
            ++*g;
            *n = 0;
        }
    } while (2 * *g - 2 + *n <= 0);
}

/* The lines read: g, n and value of each, in file order. */
typedef struct {
    slong *g, *n, count, alloc;
    fmpq *v;
} import_lines;

static void import_lines_push(import_lines *L, slong g, slong n, fmpq_t v)
{
    if (L->count == L->alloc) {
        slong alloc = L->alloc ? 2 * L->alloc : 1024;
        fmpq *w = _fmpq_vec_init(alloc);
        for (slong k = 0; k < L->count; k++)
            fmpq_swap(w + k, L->v + k);
        if (L->v)
            _fmpq_vec_clear(L->v, L->alloc);
        L->v = w;
        L->g = xrealloc(L->g, (size_t)alloc * sizeof(slong));
        L->n = xrealloc(L->n, (size_t)alloc * sizeof(slong));
        L->alloc = alloc;
    }
    L->g[L->count] = g;
    L->n[L->count] = n;
    fmpq_swap(L->v + L->count, v);
    L->count++;
}

static void import_lines_clear(import_lines *L)
{
    if (L->v)
        _fmpq_vec_clear(L->v, L->alloc);
    free(L->g);
    free(L->n);
}

/* Reads every line of the file into L. Returns 0, or 1 after reporting. */
static int import_read(const import_table *T, import_lines *L)
{
    FILE *f = fopen(T->path, "r");
    struct stat sb;
    if (!f) {
        fprintf(stderr, "psikappa: cannot read %s\n", T->path);
        return 1;
    }
    if (fstat(fileno(f), &sb) != 0 || !S_ISREG(sb.st_mode)) {   /* not /dev/zero, a pipe, a folder */
        fclose(f);
        return import_fail(T, 0, "not a regular file");
    }
    char *buf = NULL;
    size_t cap = 0;
    int bad = 0;
    fmpq_t v;
    fmpq_init(v);
    while (!bad && getline(&buf, &cap, f) >= 0) {
        slong g, n;
        if (!import_parse_line(buf, &g, &n, v) || g > IMPORT_MAX_G || n > IMPORT_MAX_N)
            bad = import_fail(T, (long)L->count + 1, "not a line \"g n numerator/denominator\" in lowest terms");
        else
            import_lines_push(L, g, n, v);
    }
    fmpq_clear(v);
    free(buf);
    fclose(f);
    return bad;
}

/* Places the lines into T after checking that they are every stable (g, n), g <= G, n <= N,
   in the driver's order, each positive. Returns 0 or 1 after reporting. */
static int import_place(import_table *T, import_lines *L)
{
    T->N = 0;
    for (slong k = 0; k < L->count; k++)
        T->N = L->n[k] > T->N ? L->n[k] : T->N;
    T->G = L->count ? L->g[L->count - 1] : -1;
    if (T->G < 0)
        return import_fail(T, 0, "no table in this file");
    T->t = _fmpq_vec_init((T->G + 1) * (T->N + 1));
    T->line = xcalloc((size_t)((T->G + 1) * (T->N + 1)), sizeof(slong));
    slong g = 0, n = -1;
    import_next(&g, &n, T->N);
    for (slong k = 0; k < L->count; k++) {
        if (L->g[k] != g || L->n[k] != n) {
            char msg[200];
            snprintf(msg, sizeof msg, "expected V_{%ld,%ld} here, found V_{%ld,%ld} (a table lists every stable "
                     "(g, n) with g <= G, n <= N, g then n ascending)", (long)g, (long)n, (long)L->g[k],
                     (long)L->n[k]);
            return import_fail(T, (long)k + 1, msg);
        }
        if (fmpq_sgn(L->v + k) <= 0)
            return import_fail(T, (long)k + 1, "a volume is positive");
        fmpq_swap(T->t + g * (T->N + 1) + n, L->v + k);
        T->line[g * (T->N + 1) + n] = k + 1;
        import_next(&g, &n, T->N);
    }
    if (g != T->G + 1)
        return import_fail(T, (long)L->count, "the table ends inside a genus (the file is cut short)");
    return 0;
}

/* (3g-3+n)! v mod p, or UWORD_MAX when p divides the denominator. */
static ulong import_residue(const fmpq_t v, slong g, slong n, nmod_t mod)
{
    ulong num = fmpz_fdiv_ui(fmpq_numref(v), mod.n), den = fmpz_fdiv_ui(fmpq_denref(v), mod.n), f = 1;
    if (den == 0)
        return UWORD_MAX;
    for (slong k = 2; k <= 3 * g - 3 + n; k++)
        f = nmod_mul(f, (ulong)k, mod);
    return nmod_mul(nmod_mul(num, f, mod), n_invmod(den, mod.n), mod);
}

/* Whether the check (one prime of the table engine) is within --max-seconds and the engine's
   memory limit, by the engine's model; reports when it is not. */
static int import_check_affordable(const interp *I, const import_table *T)
{
    double sec, each, root, primes;
    wpvol_estimate_spread(&sec, &each, &root, &primes, T->G, T->N, 1);
    double one = primes >= 1.0 ? sec / primes : sec;
    if (one <= I->lim.max_seconds && each <= WPVOL_MAX_BYTES)
        return 1;
    char msg[240];
    snprintf(msg, sizeof msg, "checking this table takes one prime of the volume engine, about %.3g s and %.3g GiB "
             "(limits: %.3g s, raise with --max-seconds S; %.3g GiB)", one, each / 1073741824.0,
             I->lim.max_seconds, WPVOL_MAX_BYTES / 1073741824.0);
    import_fail(T, 0, msg);
    return 0;
}

/* Every stable value against the engine's residues modulo p. Returns 0 or 1 after reporting. */
static int import_check(const interp *I, import_table *T, ulong p)
{
    if (!import_check_affordable(I, T))
        return 1;
    slong G = T->G, N = T->N, size = (G + 1) * (N + 1);
    ulong *res = xmalloc((size_t)size * sizeof(ulong));
    int rc = wpvol_table_residues(res, G, N, &p, 1, 1);
    int bad = 0;
    if (rc != WPVOL_OK) {
        bad = import_fail(T, 0, "the engine could not compute its residues for the check");
    } else {
        nmod_t mod;
        nmod_init(&mod, p);
        for (slong k = 0; k < size && !bad; k++) {
            slong g = k / (N + 1), n = k % (N + 1);
            if (T->line[k] > 0 && import_residue(T->t + k, g, n, mod) != res[k]) {
                char msg[200];
                snprintf(msg, sizeof msg, "V_{%ld,%ld} does not agree with this engine modulo the prime %lu (a changed "
                         "file, or a table of another engine)", (long)g, (long)n, (unsigned long)p);
                bad = import_fail(T, (long)T->line[k], msg);
            }
        }
    }
    free(res);
    return bad;
}

int voltab_import_file(interp *I, const char *path)
{
    import_table T = {path, 0, 0, NULL, NULL};
    import_lines L = {NULL, NULL, 0, 0, NULL};
    ulong p = wpvol_check_prime();
    int bad = import_read(&T, &L) || import_place(&T, &L);
    import_lines_clear(&L);
    if (!bad && (I->store_off || I->verify))
        bad = import_fail(&T, 0, "the results store is off (--no-store, --verify or PSIKAPPA_STORE=off)");
    if (!bad)
        bad = import_check(I, &T, p);
    if (!bad) {
        int w = voltab_store_table(I, T.t, T.G, T.N, 1e9);
        if (w == VOLTAB_WRITTEN)
            fprintf(I->out, "stored V_{g,n}, g <= %ld, n <= %ld from %s (every value checked modulo the prime %lu)\n",
                    (long)T.G, (long)T.N, path, (unsigned long)p);
        else if (w == VOLTAB_HELD)
            fprintf(I->out, "the store already holds a table with n <= %ld and at least g <= %ld: nothing imported\n",
                    (long)T.N, (long)T.G);
        else
            bad = import_fail(&T, 0, "the results store did not take the table");
    }
    if (T.t)
        _fmpq_vec_clear(T.t, (T.G + 1) * (T.N + 1));
    free(T.line);
    return bad;
}
