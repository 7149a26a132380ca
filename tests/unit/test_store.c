/* test_store.c - unit tests for the results store (src/store.h).
 *
 * Every test works in a fresh temporary folder. Damage is made the way it happens in practice:
 * garbage bytes written over the whole file or over one page, a database of another program at
 * the path, and rows edited behind the store's back with SQLite itself. The checksum constants
 * were computed with an independent FNV-1a in python3 (the byte string of each field followed
 * by a NUL byte, offset basis 14695981039346656037, prime 1099511628211).
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <sqlite3.h>

#include "store.h"
#include "unit.h"

static unit_report rep;
static char dir[] = "/tmp/pk-test-store-XXXXXX";

/* Path of a file in the test folder (static buffer per slot). */
static const char *in_dir(int slot, const char *name)
{
    static char buf[4][512];
    snprintf(buf[slot], sizeof buf[slot], "%s/%s", dir, name);
    return buf[slot];
}

static void write_bytes(const char *path, long offset, long n, unsigned seed)
{
    FILE *f = fopen(path, offset ? "r+b" : "wb");
    if (!f)
        return;
    fseek(f, offset, SEEK_SET);
    for (long i = 0; i < n; i++) {
        seed = seed * 1103515245u + 12345u;
        fputc((int)(seed >> 16) & 0xff, f);
    }
    fclose(f);
}

static long file_size(const char *path)
{
    struct stat sb;
    return stat(path, &sb) == 0 ? (long)sb.st_size : -1;
}

/* Runs one SQL statement on the file behind the store's back; returns its first integer result. */
static long sql(const char *path, const char *text)
{
    sqlite3 *db = NULL;
    sqlite3_stmt *st = NULL;
    long r = -1;
    if (sqlite3_open(path, &db) == SQLITE_OK && sqlite3_prepare_v2(db, text, -1, &st, NULL) == SQLITE_OK) {
        int rc = sqlite3_step(st);
        r = rc == SQLITE_ROW ? (long)sqlite3_column_int64(st, 0) : rc == SQLITE_DONE ? 0 : -1;
    }
    sqlite3_finalize(st);
    sqlite3_close(db);
    return r;
}

/* Expects a hit with the given answer. */
static void expect_hit(store *S, const char *q, const char *want, const char *what)
{
    char *a = (char *)"unchanged";
    int hit = store_get(S, q, &a);
    UNIT_CHECK(&rep, hit == 1 && a && strcmp(a, want) == 0, "%s: hit %d answer %s, want %s", what, hit,
               a ? a : "(null)", want);
    free(hit ? a : NULL);
}

static void expect_miss(store *S, const char *q, const char *what)
{
    char *a = (char *)"unchanged";
    int hit = store_get(S, q, &a);
    UNIT_CHECK(&rep, hit == 0 && a == NULL, "%s: expected a miss, got %d / %s", what, hit, a ? a : "(null)");
    if (hit)
        free(a);
}

static void test_checksum_and_paths(void)
{
    UNIT_CHECK(&rep, store_checksum("0.1.0", "<tau_4>_2", "1/1152") == 0x6119f1d4623707c3ULL, "checksum vector 1");
    UNIT_CHECK(&rep, store_checksum("", "", "") == 0xd94d12186c0f2fb7ULL, "checksum vector 2");
    UNIT_CHECK(&rep, store_checksum("a", "bc", "") != store_checksum("ab", "c", ""), "fields must not slide");

    char buf[512];
    setenv("HOME", "/home/someone", 1);
    setenv("XDG_CACHE_HOME", "/var/cache/me", 1);
    const char *p = store_default_path(buf, sizeof buf);
    UNIT_CHECK(&rep, p && strcmp(p, "/var/cache/me/psikappa/results.sqlite") == 0, "XDG path: %s", p ? p : "(null)");
    setenv("XDG_CACHE_HOME", "relative/cache", 1);
    p = store_default_path(buf, sizeof buf);
    UNIT_CHECK(&rep, p && strcmp(p, "/home/someone/.cache/psikappa/results.sqlite") == 0, "relative XDG ignored: %s",
               p ? p : "(null)");
    UNIT_CHECK(&rep, store_default_path(buf, 10) == NULL, "too small a buffer must give NULL");
    unsetenv("XDG_CACHE_HOME");
    unsetenv("HOME");
    UNIT_CHECK(&rep, store_default_path(buf, sizeof buf) == NULL, "no HOME: NULL");
}

static void test_round_trip(void)
{
    char *err = NULL;
    const char *path = in_dir(0, "a/b/results.sqlite"); /* parent folders do not exist yet */
    store *S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && !err, "open fresh: %s", err ? err : "");
    free(err);
    if (!S)
        return;
    size_t n = 100000;
    char *big = malloc(n + 1);
    for (size_t i = 0; i < n; i++)
        big[i] = (char)('0' + i % 10);
    big[n] = '\0';
    UNIT_CHECK(&rep, store_put(S, "<tau_4>_2", "1/1152"), "put 1");
    UNIT_CHECK(&rep, store_put(S, "V(1,1) in L_1, \xc3\xa9", "(L_1^2 + 4*pi^2)/48"), "put 2");
    UNIT_CHECK(&rep, store_put(S, "big", big), "put big");
    expect_hit(S, "<tau_4>_2", "1/1152", "round trip");
    expect_hit(S, "V(1,1) in L_1, \xc3\xa9", "(L_1^2 + 4*pi^2)/48", "round trip non-ASCII");
    expect_hit(S, "big", big, "round trip 100k");
    expect_miss(S, "<tau_1>_1", "unknown question");
    expect_miss(S, "<tau_4>_2 ", "questions are exact text");
    UNIT_CHECK(&rep, store_put(S, "<tau_4>_2", "replaced"), "replace");
    expect_hit(S, "<tau_4>_2", "replaced", "replaced answer");
    UNIT_CHECK(&rep, sql(path, "SELECT count(*) FROM results") == 3, "replace must not add a row");
    store_close(S);

    S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && !err, "reopen: %s", err ? err : "");
    free(err);
    expect_hit(S, "big", big, "persisted across close");
    store_close(S);
    free(big);
}

static void test_versions(void)
{
    char *err = NULL;
    const char *path = in_dir(0, "versions.sqlite");
    store *v1 = store_open(path, "0.1.0", &err);
    free(err);
    store *v2 = store_open(path, "0.2.0", &err); /* two handles on one file at once */
    free(err);
    UNIT_CHECK(&rep, v1 && v2, "open two versions");
    if (!v1 || !v2) {
        store_close(v1);
        store_close(v2);
        return;
    }
    store_put(v1, "int_{2,0} kappa_1^3", "43/2880");
    expect_miss(v2, "int_{2,0} kappa_1^3", "other engine version");
    store_put(v2, "int_{2,0} kappa_1^3", "from v2");
    expect_hit(v1, "int_{2,0} kappa_1^3", "43/2880", "v1 keeps its answer");
    expect_hit(v2, "int_{2,0} kappa_1^3", "from v2", "v2 has its own");
    store_close(v1);
    store_close(v2);
    char *a = NULL;
    UNIT_CHECK(&rep, store_get(NULL, "x", &a) == 0 && a == NULL && store_put(NULL, "x", "y") == 0,
               "NULL store is always a miss");
    store_close(NULL);
}

/* Opens a damaged file; the store must say "corrupt ... rebuilt", keep the old bytes aside and work. */
static void expect_rebuilt(const char *path, long old_size, const char *what)
{
    char *err = NULL, aside[600];
    store *S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && err && strstr(err, "corrupt") && strstr(err, "rebuilt"), "%s: err %s", what,
               err ? err : "(none)");
    snprintf(aside, sizeof aside, "%s.corrupt", path);
    UNIT_CHECK(&rep, file_size(aside) == old_size, "%s: old file kept aside (%ld bytes, want %ld)", what,
               file_size(aside), old_size);
    free(err);
    if (!S)
        return;
    expect_miss(S, "<tau_4>_2", what);
    UNIT_CHECK(&rep, store_put(S, "<tau_4>_2", "1/1152"), "%s: put after rebuild", what);
    expect_hit(S, "<tau_4>_2", "1/1152", what);
    store_close(S);
    S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && !err, "%s: rebuilt file opens cleanly: %s", what, err ? err : "");
    free(err);
    store_close(S);
}

static void test_corrupt_files(void)
{
    const char *path = in_dir(0, "garbage.sqlite");
    write_bytes(path, 0, 5000, 7);
    expect_rebuilt(path, 5000, "garbage file");

    path = in_dir(0, "short.sqlite");
    write_bytes(path, 0, 10, 9);
    expect_rebuilt(path, 10, "short garbage");

    /* a real store with one interior page overwritten */
    char *err = NULL;
    path = in_dir(0, "page.sqlite");
    store *S = store_open(path, "0.1.0", &err);
    free(err);
    char q[64], a[600];
    memset(a, 'x', sizeof a - 1);
    a[sizeof a - 1] = '\0';
    for (int i = 0; S && i < 300; i++) {
        snprintf(q, sizeof q, "question %d", i);
        store_put(S, q, a);
    }
    store_close(S);
    long size = file_size(path);
    write_bytes(path, 4096 * 3, 4096, 11);
    expect_rebuilt(path, size, "overwritten page");

    /* another program's database at the path */
    path = in_dir(0, "foreign.sqlite");
    sql(path, "CREATE TABLE accounts(id INTEGER, balance REAL)");
    expect_rebuilt(path, file_size(path), "foreign schema");
}

/* Above the size where the full check is skipped: damage inside must still
   never produce a wrong answer, only misses, and the store must keep working. */
static void test_large_damaged_store(void)
{
    char *err = NULL, q[32], a[1000];
    const char *path = in_dir(0, "large.sqlite");
    store *S = store_open(path, "0.1.0", &err);
    free(err);
    if (!S)
        return;
    for (int i = 0; i < 5000; i++) {
        snprintf(q, sizeof q, "q%d", i);
        memset(a, 'a' + i % 26, sizeof a - 1);
        a[sizeof a - 1] = '\0';
        store_put(S, q, a);
    }
    store_close(S);
    long size = file_size(path);
    UNIT_CHECK(&rep, size > (4L << 20), "large store is %ld bytes, want more than 4 MiB", size);
    write_bytes(path, 2L << 20, 64L << 10, 13);
    S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S != NULL, "large damaged store opens: %s", err ? err : "");
    free(err);
    if (!S)
        return;
    int hits = 0, wrong = 0;
    for (int i = 0; i < 5000; i++) {
        char *got = NULL;
        snprintf(q, sizeof q, "q%d", i);
        if (store_get(S, q, &got)) {
            hits++;
            wrong += strlen(got) != sizeof a - 1 || got[0] != 'a' + i % 26 || got[998] != 'a' + i % 26;
            free(got);
        }
    }
    UNIT_CHECK(&rep, wrong == 0, "%d wrong answers from a damaged store", wrong);
    UNIT_CHECK(&rep, hits > 0 && hits < 5000, "damage must cost some rows, not all: %d hits", hits);
    store_put(S, "after damage", "still usable?");
    store_close(S);
}

static void test_tampered_rows(void)
{
    char *err = NULL;
    const char *path = in_dir(0, "tamper.sqlite");
    store *S = store_open(path, "0.1.0", &err);
    free(err);
    if (!S)
        return;
    store_put(S, "int_{2,0} kappa_1^3", "43/2880");
    store_put(S, "<tau_4>_2", "1/1152");
    store_put(S, "<tau_1>_1", "1/24");
    UNIT_CHECK(&rep, sql(path, "UPDATE results SET answer = '43/2881' WHERE question = 'int_{2,0} kappa_1^3'") == 0,
               "tamper answer");
    UNIT_CHECK(&rep, sql(path, "UPDATE results SET question = '<tau_4>_3' WHERE question = '<tau_4>_2'") == 0,
               "tamper question");
    UNIT_CHECK(&rep, sql(path, "UPDATE results SET checksum = 'x' WHERE question = '<tau_1>_1'") == 0,
               "tamper checksum type");
    expect_miss(S, "int_{2,0} kappa_1^3", "edited answer");
    expect_miss(S, "<tau_4>_3", "edited question");
    expect_miss(S, "<tau_1>_1", "non-integer checksum");
    UNIT_CHECK(&rep, store_dropped(S) == 3, "three rows dropped, got %ld", store_dropped(S));
    UNIT_CHECK(&rep, sql(path, "SELECT count(*) FROM results") == 0, "tampered rows deleted");
    store_put(S, "<tau_1>_1", "1/24");
    expect_hit(S, "<tau_1>_1", "1/24", "fresh row after a drop");
    store_close(S);
}

static void test_unusable_paths(void)
{
    char *err = NULL;
    store *S = store_open("/dev/null/sub/results.sqlite", "0.1.0", &err);
    UNIT_CHECK(&rep, !S && err, "folder under a device file: %s", err ? err : "(no error)");
    free(err);
    mkdir(in_dir(0, "isdir"), 0700);
    S = store_open(in_dir(0, "isdir"), "0.1.0", &err);
    UNIT_CHECK(&rep, !S && err && strstr(err, "cannot"), "a folder is not a store: %s", err ? err : "(no error)");
    UNIT_CHECK(&rep, file_size(in_dir(1, "isdir.corrupt")) < 0, "a folder must never be moved aside");
    free(err);
    S = store_open("", "0.1.0", &err);
    UNIT_CHECK(&rep, !S && err, "empty path");
    free(err);
}

int main(void)
{
    if (!mkdtemp(dir)) {
        perror("mkdtemp");
        return 1;
    }
    test_checksum_and_paths();
    test_round_trip();
    test_versions();
    test_corrupt_files();
    test_tampered_rows();
    test_large_damaged_store();
    test_unusable_paths();
    if (rep.failed == 0) {
        char cmd[128];
        snprintf(cmd, sizeof cmd, "rm -rf %s", dir);
        if (system(cmd) != 0)
            fprintf(stderr, "could not remove %s\n", dir);
    } else {
        fprintf(stderr, "test files kept in %s\n", dir);
    }
    return unit_finish("test_store", &rep);
}
