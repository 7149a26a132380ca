/* Tables of the volume engine in the results store. A table of V_{g,n}, g <= G, n <= N takes
   hours at large G, so it is kept as one row (one transaction: a run stopped before the table is
   complete writes nothing, and a row is the whole table or absent). One row per number of points
   N, under the key hash("volume table", N), holding the largest G computed; a second row, the
   index (hash("volume table index")), lists the pairs (N, G) stored, so that a run asking for
   V_{g,n} finds a table without guessing N. The index is only a hint: the table's own first line
   says what it holds, and two runs writing at once can at worst lose a table, never mix one.
   Format of a table row (docs/volumes-engine.md): the line "volume-table-1 G N", then the
   (G+1)(N+1) values g-major, one a line, as numerator/denominator in lowest terms (0 for the
   unstable (g, n)). The store keys rows by the engine's version, so a table of another version
   is never read. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "results.h"
#include "sha256.h"
#include "strbuf.h"
#include "util.h"
#include "volume_table_store.h"

#define VOLTAB_TAG "volume-table-1"

/* Stored tables are few (one per N); an index longer than this is not ours. */
#define VOLTAB_INDEX_MAX 64

typedef struct {
    slong N, G;
} voltab_entry;

/* The store's key for the table with N points (N < 0: the index). */
static void voltab_key(slong N, char key[65])
{
    sha256_ctx h;
    char num[32];
    sha256_init(&h);
    sha256_update_field(&h, N < 0 ? "volume table index" : "volume table");
    if (N >= 0) {
        snprintf(num, sizeof num, "%ld", (long)N);
        sha256_update_field(&h, num);
    }
    sha256_final_hex(&h, key);
}

static int voltab_store_usable(const interp *I)
{
    return !I->store_off && !I->verify;
}

char *voltab_text(const fmpq *t, slong G, slong N)
{
    strbuf b;
    strbuf_init(&b);
    strbuf_printf(&b, VOLTAB_TAG " %ld %ld\n", (long)G, (long)N);
    for (slong k = 0; k < (G + 1) * (N + 1); k++) {
        strbuf_put_fmpq(&b, t + k);
        strbuf_putc(&b, '\n');
    }
    return strbuf_take(&b);
}

/* Reads one value line s (NUL-terminated, digits and at most one '/') into v, which must be in
   lowest terms, positive for a stable (g, n) and 0 otherwise. Returns 1 when it is. */
static int voltab_read_value(fmpq_t v, const char *s, slong g, slong n)
{
    size_t len = strlen(s);
    if (len == 0 || strspn(s, "0123456789/") != len || s[0] == '/' || s[len - 1] == '/')
        return 0;
    const char *slash = strchr(s, '/');
    if (slash && strchr(slash + 1, '/'))
        return 0;
    if (fmpq_set_str(v, s, 10) != 0 || !fmpq_is_canonical(v))
        return 0;
    int stable = 2 * g - 2 + n > 0;
    return stable ? fmpq_sgn(v) > 0 : fmpq_is_zero(v);
}

/* Reads the lines of buf (modified: line ends become NULs) after the header into t. */
static int voltab_read_values(fmpq *t, char *p, slong G, slong N)
{
    for (slong k = 0; k < (G + 1) * (N + 1); k++) {
        char *end = strchr(p, '\n');
        if (!end)
            return 0;
        *end = '\0';
        if (!voltab_read_value(t + k, p, k / (N + 1), k % (N + 1)))
            return 0;
        p = end + 1;
    }
    return *p == '\0';
}

/* Whether text has exactly `lines` line ends (checked before any allocation). */
static int voltab_line_count_is(const char *text, slong lines)
{
    slong c = 0;
    for (const char *p = text; (p = strchr(p, '\n')) != NULL; p++)
        if (++c > lines)
            return 0;
    return c == lines;
}

int voltab_read(const char *text, fmpq **t, slong *G, slong *N)
{
    long g = -1, n = -1;
    char head[80];
    *t = NULL;
    if (sscanf(text, VOLTAB_TAG " %ld %ld", &g, &n) != 2 || g < 0 || n < 0 || g > 100000 || n > 100000)
        return 0;
    snprintf(head, sizeof head, VOLTAB_TAG " %ld %ld\n", g, n);   /* the header exactly, nothing else */
    if (strncmp(text, head, strlen(head)) != 0 || !voltab_line_count_is(text, (g + 1) * (n + 1) + 1))
        return 0;
    const char *nl = strchr(text, '\n');
    char *buf = xstrdup(nl + 1);
    fmpq *tab = _fmpq_vec_init((g + 1) * (n + 1));
    int ok = voltab_read_values(tab, buf, g, n);
    free(buf);
    if (!ok) {
        _fmpq_vec_clear(tab, (g + 1) * (n + 1));
        return 0;
    }
    *t = tab;
    *G = g;
    *N = n;
    return 1;
}

/* The index of stored tables: up to VOLTAB_INDEX_MAX pairs, *count of them; 0 when there is
   none or it does not read as one. */
static int voltab_index_read(interp *I, voltab_entry *e, int *count)
{
    char key[65], *text = NULL;
    *count = 0;
    voltab_key(-1, key);
    if (!results_lookup_text(I, key, &text))
        return 0;
    const char *p = text;
    long N, G;
    int used, ok = 1;
    while (ok && *p && sscanf(p, "%ld %ld\n%n", &N, &G, &used) == 2 && used > 0) {
        ok = N >= 0 && G >= 0 && *count < VOLTAB_INDEX_MAX;
        if (ok)
            e[(*count)++] = (voltab_entry){N, G};
        p += used;
    }
    if (!ok || *p)
        *count = 0;
    free(text);
    return *count > 0;
}

/* Whether the table (G, N) holds V_{g,n} and every entry of the session's table. */
static int voltab_covers(const interp *I, slong G, slong N, slong g, slong n)
{
    return G >= g && N >= n && (!I->wpv || (G >= I->wpv_G && N >= I->wpv_N));
}

/* Among the stored tables that cover, the one with most genera, then fewest points; -1 if none. */
static int voltab_choose(const interp *I, const voltab_entry *e, int count, slong g, slong n)
{
    int best = -1;
    for (int i = 0; i < count; i++)
        if (voltab_covers(I, e[i].G, e[i].N, g, n)
            && (best < 0 || e[i].G > e[best].G || (e[i].G == e[best].G && e[i].N < e[best].N)))
            best = i;
    return best;
}

int voltab_store_fill(interp *I, slong g, slong n)
{
    voltab_entry e[VOLTAB_INDEX_MAX];
    int count, i;
    if (!voltab_store_usable(I) || !voltab_index_read(I, e, &count)
        || (i = voltab_choose(I, e, count, g, n)) < 0)
        return 0;
    char key[65], *text = NULL;
    fmpq *t = NULL;
    slong G, N;
    voltab_key(e[i].N, key);
    int ok = results_lookup_text(I, key, &text) && voltab_read(text, &t, &G, &N);
    free(text);
    if (ok && (N != e[i].N || !voltab_covers(I, G, N, g, n))) {   /* the index was behind the row */
        _fmpq_vec_clear(t, (G + 1) * (N + 1));
        ok = 0;
    }
    if (!ok)
        return 0;
    voltab_adopt(I, t, G, N);
    return 1;
}

void voltab_adopt(interp *I, fmpq *t, slong G, slong N)
{
    if (I->wpv)
        _fmpq_vec_clear(I->wpv, (I->wpv_G + 1) * (I->wpv_N + 1));
    I->wpv = t;
    I->wpv_G = G;
    I->wpv_N = N;
}

/* Writes the index e[0..count) (one line "N G" per stored table). */
static void voltab_index_write(interp *I, const voltab_entry *e, int count)
{
    char key[65];
    strbuf b;
    strbuf_init(&b);
    for (int i = 0; i < count; i++)
        strbuf_printf(&b, "%ld %ld\n", (long)e[i].N, (long)e[i].G);
    voltab_key(-1, key);
    /* the index is cheap but worthless without its table: written whenever the table was */
    results_save_text(I, key, "index of the volume tables", b.data, 1e9);
    strbuf_clear(&b);
}

/* voltab_store_table inside its transaction. */
static int voltab_keep_table_and_index(interp *I, const fmpq *t, slong G, slong N, double seconds)
{
    voltab_entry e[VOLTAB_INDEX_MAX + 1];
    int count = 0, j = 1;
    voltab_index_read(I, e + 1, &count);
    for (int i = 1; i <= count; i++)
        if (e[i].N == N && e[i].G >= G)
            return VOLTAB_HELD;   /* as much is stored already */
    char key[65], label[96], *text = voltab_text(t, G, N);
    voltab_key(N, key);
    snprintf(label, sizeof label, "V_{g,n}, g <= %ld, n <= %ld (volume table)", (long)G, (long)N);
    int written = results_save_text(I, key, label, text, seconds);
    free(text);
    if (!written)
        return VOLTAB_NOT_WRITTEN;
    e[0] = (voltab_entry){N, G};   /* first, so that it survives the index's bound */
    for (int i = 1; i <= count; i++)   /* drop this N's old entry and the tables this one covers */
        if (e[i].N != N && !(e[i].N <= N && e[i].G <= G))
            e[j++] = e[i];
    voltab_index_write(I, e, j > VOLTAB_INDEX_MAX ? VOLTAB_INDEX_MAX : j);
    return VOLTAB_WRITTEN;
}

int voltab_store_table(interp *I, const fmpq *t, slong G, slong N, double seconds)
{
    if (!voltab_store_usable(I))
        return VOLTAB_NOT_WRITTEN;
    /* the index read, the table written and the index rewritten, by one process at a time:
       two runs storing tables at once would otherwise each rewrite the index it read before
       the other's table, and one of the tables would drop out of it */
    int tx = results_begin(I);
    int r = voltab_keep_table_and_index(I, t, G, N, seconds);
    if (tx)
        results_end(I);
    return r;
}

void voltab_store_keep(interp *I, double seconds)
{
    if (I->wpv)
        voltab_store_table(I, I->wpv, I->wpv_G, I->wpv_N, seconds);
}
