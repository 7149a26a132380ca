/* test_volume_table_store.c - the text of a volume table as the results store keeps it
 * (src/lang/volume_table_store.c). Property tests: a table computed by the volume engine reads
 * back entry for entry; a text that is not one whole table (cut short, a line too many, a value
 * not in lowest terms, a negative or zero stable value, a nonzero unstable one, another header)
 * is refused, so that a damaged or partial row is a miss and never a table.
 */
#include <stdlib.h>
#include <string.h>

#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "volumes/wpvol.h"
#include "volume_table_store.h"
#include "unit.h"

static unit_report rep;

/* Whether text reads as a table (the table is freed). */
static int reads(const char *text)
{
    fmpq *t;
    slong G, N;
    if (!voltab_read(text, &t, &G, &N))
        return 0;
    _fmpq_vec_clear(t, (G + 1) * (N + 1));
    return 1;
}

/* text with the first occurrence of `from` replaced by `to` (new string). */
static char *replaced(const char *text, const char *from, const char *to)
{
    const char *at = strstr(text, from);
    size_t len = strlen(text) + strlen(to) + 1;
    char *r = malloc(len);
    if (!at) {
        strcpy(r, text);
        return r;
    }
    memcpy(r, text, (size_t)(at - text));
    strcpy(r + (at - text), to);
    strcat(r, at + strlen(from));
    return r;
}

static void check_refused(const char *text, const char *from, const char *to, const char *what)
{
    char *bad = replaced(text, from, to);
    UNIT_CHECK(&rep, strcmp(bad, text) != 0 && !reads(bad), "%s was read as a table", what);
    free(bad);
}

int main(void)
{
    const slong G = 9, N = 4, nv = (G + 1) * (N + 1);
    fmpq *t = _fmpq_vec_init(nv), *back = NULL;
    slong G2 = -1, N2 = -1;
    int st = wpvol_table(t, G, N, 2);
    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table failed (%d)", st);
    char *text = voltab_text(t, G, N);

    /* round trip: every entry, and the sizes */
    int ok = voltab_read(text, &back, &G2, &N2);
    UNIT_CHECK(&rep, ok && G2 == G && N2 == N, "table did not read back (G %ld, N %ld)", (long)G2, (long)N2);
    for (slong k = 0; ok && k < nv; k++)
        UNIT_CHECK(&rep, fmpq_equal(t + k, back + k), "entry (%ld, %ld) differs", (long)(k / (N + 1)),
                   (long)(k % (N + 1)));
    if (ok)
        _fmpq_vec_clear(back, nv);

    /* cut short: the last line, half the last line, everything after the header */
    size_t len = strlen(text);
    char *cut = malloc(len + 1);
    for (size_t keep = len - 1; keep > len - 40; keep -= 7) {
        memcpy(cut, text, keep);
        cut[keep] = '\0';
        UNIT_CHECK(&rep, !reads(cut), "a table cut to %zu of %zu bytes was read", keep, len);
    }
    strcpy(cut, text);
    *strchr(cut, '\n') = '\0';
    UNIT_CHECK(&rep, !reads(cut), "the header alone was read as a table");
    free(cut);

    /* one line too many */
    char *more = malloc(len + 8);
    strcpy(more, text);
    strcat(more, "1/2\n");
    UNIT_CHECK(&rep, !reads(more), "a table with an extra line was read");
    free(more);

    /* values: V_{1,1} = 1/24 is entry (1, 1); V_{0,3} = 1 is the first stable entry */
    check_refused(text, "\n1/24\n", "\n2/48\n", "a value not in lowest terms");
    check_refused(text, "\n1/24\n", "\n-1/24\n", "a negative value");
    check_refused(text, "\n1/24\n", "\n0\n", "a zero stable value");
    check_refused(text, "\n0\n", "\n5\n", "a nonzero unstable value");
    check_refused(text, "\n1/24\n", "\n1/24 \n", "a value with a trailing blank");
    check_refused(text, "volume-table-1 9 4", "volume-table-1 9 5", "a header with more points");
    check_refused(text, "volume-table-1 9 4", "volume-table-1 8 4", "a header with fewer genera");
    check_refused(text, "volume-table-1", "volume-table-9", "another format");
    check_refused(text, "volume-table-1 9 4\n", "volume-table-1 9 4 x\n", "a header with more words");
    check_refused(text, "volume-table-1 9 4", "volume-table-1 90000 4000",
                  "a header claiming a huge table (refused before allocating it)");

    free(text);
    _fmpq_vec_clear(t, nv);
    return unit_finish("test_volume_table_store", &rep);
}
