/* test_store.c - unit tests for the results store (src/store/store.h).
 *
 * Every test works in a fresh temporary folder. Damage is made the way it happens in practice:
 * garbage bytes written over one page, a truncated file, rows edited behind the store's back with
 * SQLite itself. Files that are not ours (garbage, another program's database, a newer format,
 * a pipe, a folder) must be refused and left byte for byte as they were. The checksum constants
 * were computed with Python's hashlib (SHA-256 of each field followed by a NUL byte).
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <errno.h>
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

/* store_put with a label made from the key. */
static int put(store *S, const char *key, const char *answer)
{
    char label[80];
    snprintf(label, sizeof label, "label of %.60s", key);
    return store_put(S, key, label, answer);
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
    char a[65], b[65];
    store_checksum("0.1.0", "<tau_4>_2", "1/1152", a);
    UNIT_CHECK(&rep, strcmp(a, "6f4db10b6507ebf2005dc05893d523c37049ff4b38f301452fde6f190788c6ff") == 0,
               "checksum vector 1: %s", a);
    store_checksum("", "", "", a);
    UNIT_CHECK(&rep, strcmp(a, "709e80c88487a2411e1ee4dfb9f22a861492d20c4765150c0c794abd70f8147c") == 0,
               "checksum vector 2: %s", a);
    store_checksum("a", "bc", "", a);
    store_checksum("ab", "c", "", b);
    UNIT_CHECK(&rep, strcmp(a, b) != 0, "fields must not slide");
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
    UNIT_CHECK(&rep, put(S, "<tau_4>_2", "1/1152"), "put 1");
    UNIT_CHECK(&rep, put(S, "V(1,1) in L_1, \xc3\xa9", "(L_1^2 + 4*pi^2)/48"), "put 2");
    UNIT_CHECK(&rep, put(S, "big", big), "put big");
    expect_hit(S, "<tau_4>_2", "1/1152", "round trip");
    expect_hit(S, "V(1,1) in L_1, \xc3\xa9", "(L_1^2 + 4*pi^2)/48", "round trip non-ASCII");
    expect_hit(S, "big", big, "round trip 100k");
    expect_miss(S, "<tau_1>_1", "unknown question");
    expect_miss(S, "<tau_4>_2 ", "questions are exact text");
    UNIT_CHECK(&rep, put(S, "<tau_4>_2", "replaced"), "replace");
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
    put(v1, "int_{2,0} kappa_1^3", "43/2880");
    expect_miss(v2, "int_{2,0} kappa_1^3", "other engine version");
    put(v2, "int_{2,0} kappa_1^3", "from v2");
    expect_hit(v1, "int_{2,0} kappa_1^3", "43/2880", "v1 keeps its answer");
    expect_hit(v2, "int_{2,0} kappa_1^3", "from v2", "v2 has its own");
    store_close(v1);
    store_close(v2);
    char *a = NULL;
    UNIT_CHECK(&rep, store_get(NULL, "x", &a) == 0 && a == NULL && store_put(NULL, "x", "l", "y") == 0,
               "NULL store is always a miss");
    store_close(NULL);
}

/* Opens a damaged store; the store must say "damaged ... kept as PATH.damaged-N ... started
   afresh", keep the old bytes under that name and work. */
static void expect_rebuilt(const char *path, long old_size, int n, const char *what)
{
    char *err = NULL, aside[600];
    store *S = store_open(path, "0.1.0", &err);
    snprintf(aside, sizeof aside, "%s.damaged-%d", path, n);
    UNIT_CHECK(&rep, S && err && strstr(err, "damaged") && strstr(err, aside) && strstr(err, "afresh"),
               "%s: err %s", what, err ? err : "(none)");
    UNIT_CHECK(&rep, file_size(aside) == old_size, "%s: old file kept aside (%ld bytes, want %ld)", what,
               file_size(aside), old_size);
    free(err);
    if (!S)
        return;
    expect_miss(S, "<tau_4>_2", what);
    UNIT_CHECK(&rep, put(S, "<tau_4>_2", "1/1152"), "%s: put after rebuild", what);
    expect_hit(S, "<tau_4>_2", "1/1152", what);
    store_close(S);
    S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && !err, "%s: rebuilt file opens cleanly: %s", what, err ? err : "");
    free(err);
    store_close(S);
}

/* Reads a whole file (caller frees); *n its size. */
static char *slurp(const char *path, long *n)
{
    struct stat sb;
    *n = -1;
    if (stat(path, &sb) != 0 || !S_ISREG(sb.st_mode))
        return NULL; /* a pipe would block */
    FILE *f = fopen(path, "rb");
    *n = file_size(path);
    if (!f || *n < 0) {
        if (f)
            fclose(f);
        return NULL;
    }
    char *d = malloc((size_t)*n + 1);
    *n = (long)fread(d, 1, (size_t)*n, f);
    fclose(f);
    return d;
}

/* Opening must be refused with a message naming `word`, and the file and its
   neighbourhood left exactly as they were. */
static void expect_refused(const char *path, const char *word, const char *what)
{
    long n0, n1;
    char *before = slurp(path, &n0), *err = NULL, side[600];
    store *S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, !S && err && strstr(err, "refused") && strstr(err, word), "%s: err %s", what,
               err ? err : "(none)");
    store_close(S);
    free(err);
    char *after = slurp(path, &n1);
    UNIT_CHECK(&rep, n0 == n1 && (!before || memcmp(before, after, (size_t)n0) == 0), "%s: file changed", what);
    const char *sides[] = {"-wal", "-shm", "-journal", ".damaged-1"};
    for (int i = 0; i < 4; i++) {
        snprintf(side, sizeof side, "%s%s", path, sides[i]);
        UNIT_CHECK(&rep, file_size(side) < 0 && errno == ENOENT, "%s: %s was created", what, side);
    }
    free(before);
    free(after);
}

/* A store holding `count` rows of a 600-byte answer. */
static void fill_store(const char *path, int count)
{
    char *err = NULL, q[64], a[600];
    store *S = store_open(path, "0.1.0", &err);
    free(err);
    memset(a, 'x', sizeof a - 1);
    a[sizeof a - 1] = '\0';
    for (int i = 0; S && i < count; i++) {
        snprintf(q, sizeof q, "question %d", i);
        put(S, q, a);
    }
    store_close(S);
}

static void test_foreign_files(void)
{
    const char *path = in_dir(0, "garbage.sqlite");
    write_bytes(path, 0, 5000, 7);
    expect_refused(path, "not an SQLite database", "garbage file");
    path = in_dir(0, "short.sqlite");
    write_bytes(path, 0, 10, 9);
    expect_refused(path, "not an SQLite database", "short garbage");
    path = in_dir(0, "foreign.sqlite");
    sql(path, "CREATE TABLE accounts(id INTEGER, balance REAL)");
    expect_refused(path, "another program", "another program's database");
    path = in_dir(0, "foreign-id.sqlite");
    sql(path, "PRAGMA application_id = 1234");
    sql(path, "CREATE TABLE t(x)");
    expect_refused(path, "0x000004d2", "a database with another application id");
    path = in_dir(0, "newer.sqlite");
    fill_store(path, 3);
    sql(path, "PRAGMA user_version = 99");
    expect_refused(path, "newer", "a store of a newer format");
    path = in_dir(0, "fifo.sqlite");
    UNIT_CHECK(&rep, mkfifo(path, 0600) == 0, "mkfifo");
    expect_refused(path, "pipe", "a named pipe");
    mkdir(in_dir(0, "isdir"), 0700);
    expect_refused(in_dir(0, "isdir"), "folder", "a folder");
}

static void test_damaged_files(void)
{
    const char *path = in_dir(0, "page.sqlite");
    fill_store(path, 300);
    long size = file_size(path);
    write_bytes(path, 4096 * 3, 4096, 11);
    expect_rebuilt(path, size, 1, "overwritten page");
    /* damaged again: the first copy stays, the second gets a new name */
    fill_store(path, 300);
    size = file_size(path);
    write_bytes(path, 4096 * 2, 4096, 12);
    expect_rebuilt(path, size, 2, "damaged a second time");
    UNIT_CHECK(&rep, file_size(in_dir(1, "page.sqlite.damaged-1")) > 0, "first damaged copy kept");
    /* truncated at a page boundary */
    path = in_dir(0, "cut.sqlite");
    fill_store(path, 300);
    UNIT_CHECK(&rep, truncate(path, 4096 * 5) == 0, "truncate");
    expect_rebuilt(path, 4096 * 5, 1, "truncated file");
    /* an empty file is not a store (a store is made elsewhere and linked into place) */
    path = in_dir(0, "empty.sqlite");
    write_bytes(path, 0, 0, 1);
    expect_refused(path, "empty file", "an empty file");
}

/* A store of the first format (no application id, rows keyed by printed questions) is ours:
   it is upgraded in place, its old rows dropped. */
static void test_first_format(void)
{
    const char *path = in_dir(0, "v1.sqlite");
    sql(path, "CREATE TABLE meta(key TEXT PRIMARY KEY, value TEXT NOT NULL)");
    sql(path, "INSERT INTO meta VALUES('schema', 'psikappa-results-1')");
    sql(path, "CREATE TABLE results(engine TEXT NOT NULL, question TEXT NOT NULL, answer TEXT NOT NULL,"
              " checksum INTEGER NOT NULL, PRIMARY KEY(engine, question))");
    sql(path, "INSERT INTO results VALUES('0.1.0', 'int[1,1] psi_1', '1/24', 1)");
    char *err = NULL;
    store *S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && !err, "first format opens: %s", err ? err : "");
    free(err);
    expect_miss(S, "int[1,1] psi_1", "old rows are not served");
    UNIT_CHECK(&rep, put(S, "k", "1/24"), "put in upgraded store");
    store_close(S);
    UNIT_CHECK(&rep, sql(path, "PRAGMA application_id") == STORE_APPLICATION_ID, "identity written");
    UNIT_CHECK(&rep, sql(path, "PRAGMA user_version") == STORE_FORMAT, "format written");
}

/* Above the size where the full check is skipped: damage inside is found on reading, reported,
   the file moved aside; never a wrong answer. */
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
        put(S, q, a);
    }
    store_close(S);
    long size = file_size(path);
    UNIT_CHECK(&rep, size > (4L << 20), "large store is %ld bytes, want more than 4 MiB", size);
    write_bytes(path, 2L << 20, 64L << 10, 13);
    S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S != NULL && !err, "large damaged store opens without a full check: %s", err ? err : "");
    free(err);
    if (!S)
        return;
    int hits = 0, wrong = 0, told = 0;
    for (int i = 0; i < 5000; i++) {
        char *got = NULL, *note;
        snprintf(q, sizeof q, "q%d", i);
        if (store_get(S, q, &got)) {
            hits++;
            wrong += strlen(got) != sizeof a - 1 || got[0] != 'a' + i % 26 || got[998] != 'a' + i % 26;
            free(got);
        }
        if ((note = store_take_note(S)) != NULL)
            told += strstr(note, "damaged") != NULL;
        free(note);
    }
    UNIT_CHECK(&rep, wrong == 0, "%d wrong answers from a damaged store", wrong);
    UNIT_CHECK(&rep, told >= 1, "damage found on reading must be reported");
    UNIT_CHECK(&rep, file_size(in_dir(1, "large.sqlite.damaged-1")) == size, "damaged large store kept aside");
    UNIT_CHECK(&rep, hits < 5000, "damage must cost rows: %d hits", hits);
    UNIT_CHECK(&rep, put(S, "after damage", "still usable"), "store usable after damage");
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
    put(S, "int_{2,0} kappa_1^3", "43/2880");
    put(S, "<tau_4>_2", "1/1152");
    put(S, "<tau_1>_1", "1/24");
    UNIT_CHECK(&rep, sql(path, "UPDATE results SET answer = '43/2881' WHERE key = 'int_{2,0} kappa_1^3'") == 0,
               "tamper answer");
    UNIT_CHECK(&rep, sql(path, "UPDATE results SET key = '<tau_4>_3' WHERE key = '<tau_4>_2'") == 0,
               "tamper question");
    UNIT_CHECK(&rep, sql(path, "UPDATE results SET checksum = 5 WHERE key = '<tau_1>_1'") == 0,
               "tamper checksum type");
    expect_miss(S, "int_{2,0} kappa_1^3", "edited answer");
    expect_miss(S, "<tau_4>_3", "edited question");
    expect_miss(S, "<tau_1>_1", "checksum of the wrong type");
    UNIT_CHECK(&rep, store_dropped(S) == 3, "three rows dropped, got %ld", store_dropped(S));
    UNIT_CHECK(&rep, sql(path, "SELECT count(*) FROM results") == 0, "tampered rows deleted");
    put(S, "<tau_1>_1", "1/24");
    expect_hit(S, "<tau_1>_1", "1/24", "fresh row after a drop");
    store_close(S);
}

static void test_unusable_paths(void)
{
    char *err = NULL;
    store *S = store_open("/dev/null/sub/results.sqlite", "0.1.0", &err);
    UNIT_CHECK(&rep, !S && err, "folder under a device file: %s", err ? err : "(no error)");
    free(err);
    S = store_open("", "0.1.0", &err);
    UNIT_CHECK(&rep, !S && err, "empty path");
    free(err);
}

/* Whether another connection to path gets the write lock at once (busy timeout 0). */
static int other_writer_can_begin(const char *path)
{
    sqlite3 *db = NULL;
    int yes = 0;
    if (sqlite3_open(path, &db) == SQLITE_OK) {
        yes = sqlite3_exec(db, "BEGIN IMMEDIATE", NULL, NULL, NULL) == SQLITE_OK;
        if (yes)
            sqlite3_exec(db, "ROLLBACK", NULL, NULL, NULL);
    }
    sqlite3_close(db);
    return yes;
}

/* store_begin .. store_end: while the transaction is open no other process can begin a write
   and its rows are not visible to others; after store_end they are, and writers can go on. */
static void test_transaction(void)
{
    char *err = NULL;
    const char *path = in_dir(0, "tx/results.sqlite");
    store *S = store_open(path, "0.1.0", &err);
    UNIT_CHECK(&rep, S && !err, "open for the transaction: %s", err ? err : "");
    free(err);
    if (!S)
        return;
    UNIT_CHECK(&rep, other_writer_can_begin(path), "before store_begin another writer can begin");
    UNIT_CHECK(&rep, store_begin(S) == 1, "store_begin");
    UNIT_CHECK(&rep, put(S, "table", "rows") && put(S, "index", "1 2"), "puts inside the transaction");
    UNIT_CHECK(&rep, !other_writer_can_begin(path), "inside the transaction no other writer can begin");
    UNIT_CHECK(&rep, sql(path, "SELECT count(*) FROM results") == 0, "rows invisible to others before the end");
    expect_hit(S, "index", "1 2", "the transaction sees its own rows");
    store_end(S);
    UNIT_CHECK(&rep, other_writer_can_begin(path), "after store_end another writer can begin");
    UNIT_CHECK(&rep, sql(path, "SELECT count(*) FROM results") == 2, "both rows committed together");
    store_end(S);   /* nothing open: no effect */
    UNIT_CHECK(&rep, store_begin(NULL) == 0, "store_begin(NULL)");
    store_end(NULL);
    store_close(S);
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
    test_foreign_files();
    test_damaged_files();
    test_first_format();
    test_tampered_rows();
    test_large_damaged_store();
    test_unusable_paths();
    test_transaction();
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
