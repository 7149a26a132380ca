#include "store.h"

#include <errno.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <sqlite3.h>

#include "deadline.h"

#include "util.h"

/* Bumped whenever the tables change; a file with another value is rebuilt. */
#define STORE_SCHEMA "psikappa-results-1"

/* PRAGMA quick_check reads every page (measured: about 12 ms per MiB), a
   cost a calculator started many times a minute should not pay on a large
   store. Above this size damage is found when a page is read (SQLITE_CORRUPT,
   a miss) and by the row checksums. */
#define STORE_FULL_CHECK_BYTES (4L << 20)

struct store {
    sqlite3 *db;
    char *version;                  /* engine version, owned */
    sqlite3_stmt *get, *put, *del;  /* prepared once, owned */
    long dropped;                   /* rows deleted for a bad checksum */
};

/* Result of checking an opened file. */
enum { STORE_OK, STORE_CORRUPT, STORE_FAILED };

/* FNV-1a 64 over the three fields, each NUL-terminated.
   Cheap and dependency-free; meant to catch damage, not forgery. */
unsigned long long store_checksum(const char *version, const char *question, const char *answer)
{
    uint64_t h = 14695981039346656037ULL;
    const char *parts[3] = {version, question, answer};
    for (int i = 0; i < 3; i++) {
        const unsigned char *p = (const unsigned char *)(parts[i] ? parts[i] : "");
        do {
            h ^= *p;
            h *= 1099511628211ULL;
        } while (*p++);
    }
    return (unsigned long long)h;
}

/* The checksum as SQLite's signed 64-bit integer, bit for bit.
   memcpy because converting an out-of-range unsigned value is not portable. */
static sqlite3_int64 store_checksum_db(const char *version, const char *question, const char *answer)
{
    uint64_t u = store_checksum(version, question, answer);
    sqlite3_int64 s;
    memcpy(&s, &u, sizeof s);
    return s;
}

/* The XDG cache location, else ~/.cache (see store.h).
   Returns buf, or NULL when there is no home or buf is too small. */
const char *store_default_path(char *buf, size_t len)
{
    const char *xdg = getenv("XDG_CACHE_HOME"), *home = getenv("HOME");
    int n;
    /* the XDG spec says relative values are invalid and must be ignored */
    if (xdg && xdg[0] == '/')
        n = snprintf(buf, len, "%s/psikappa/results.sqlite", xdg);
    else if (home && home[0])
        n = snprintf(buf, len, "%s/.cache/psikappa/results.sqlite", home);
    else
        return NULL;
    return n > 0 && (size_t)n < len ? buf : NULL;
}

/* Creates the missing parent directories of path (mode 0700: a per-user cache).
   Returns 1 on success, 0 with errno set otherwise. */
static int store_make_parents(const char *path)
{
    char *p = xstrdup(path);
    int ok = 1;
    for (char *s = p + 1; *s && ok; s++) {
        if (*s != '/')
            continue;
        *s = '\0';
        if (mkdir(p, 0700) != 0 && errno != EEXIST)
            ok = 0;
        *s = '/';
    }
    free(p);
    return ok;
}

/* Runs SQL without results. Returns the SQLite result code. */
static int store_exec(sqlite3 *db, const char *sql)
{
    return sqlite3_exec(db, sql, NULL, NULL, NULL);
}

/* Maps an SQLite error to "damaged file" or "other failure". */
static int store_classify(int rc)
{
    rc &= 0xff;
    return rc == SQLITE_NOTADB || rc == SQLITE_CORRUPT || rc == SQLITE_FORMAT ? STORE_CORRUPT : STORE_FAILED;
}

/* One line out of SQLite's integrity report, which may list dozens of
   follow-on problems after a "*** in database main ***" heading. */
static char *store_first_problem(const char *report)
{
    const char *s = report ? report : "no answer";
    if (strncmp(s, "***", 3) == 0 && strchr(s, '\n'))
        s = strchr(s, '\n') + 1;
    size_t n = strcspn(s, "\n");
    return xasprintf("integrity check: %.*s", (int)n, s);
}

/* PRAGMA quick_check: reads every page, so damage inside is found too.
   Returns STORE_OK, or another state with *why describing the problem. */
static int store_quick_check(sqlite3 *db, char **why)
{
    sqlite3_stmt *st = NULL;
    int rc = sqlite3_prepare_v2(db, "PRAGMA quick_check(1)", -1, &st, NULL);
    if (rc == SQLITE_OK)
        rc = sqlite3_step(st);
    int state = STORE_OK;
    if (rc == SQLITE_ROW) {
        const char *r = (const char *)sqlite3_column_text(st, 0);
        if (!r || strcmp(r, "ok") != 0) {
            state = STORE_CORRUPT;
            *why = store_first_problem(r);
        }
    } else {
        state = store_classify(rc);
        *why = xstrdup(sqlite3_errmsg(db));
    }
    sqlite3_finalize(st);
    return state;
}

/* Creates the tables in a file that has none; a no-op otherwise.
   BEGIN IMMEDIATE so that two first runs do not both create them. */
static int store_create_schema(sqlite3 *db, char **why)
{
    const char *sql = "BEGIN IMMEDIATE;"
                      "CREATE TABLE IF NOT EXISTS meta(key TEXT PRIMARY KEY, value TEXT NOT NULL);"
                      "INSERT OR IGNORE INTO meta(key, value) VALUES('schema', '" STORE_SCHEMA "');"
                      "CREATE TABLE IF NOT EXISTS results(engine TEXT NOT NULL, question TEXT NOT NULL,"
                      " answer TEXT NOT NULL, checksum INTEGER NOT NULL, PRIMARY KEY(engine, question));"
                      "COMMIT;";
    sqlite3_stmt *st = NULL;
    int rc = sqlite3_prepare_v2(db, "SELECT count(*) FROM sqlite_master", -1, &st, NULL);
    if (rc == SQLITE_OK)
        rc = sqlite3_step(st);
    int fresh = rc == SQLITE_ROW && sqlite3_column_int64(st, 0) == 0;
    sqlite3_finalize(st);
    if (rc != SQLITE_ROW) {
        *why = xstrdup(sqlite3_errmsg(db));
        return store_classify(rc);
    }
    if (fresh && (rc = store_exec(db, sql)) != SQLITE_OK) {
        *why = xstrdup(sqlite3_errmsg(db));
        store_exec(db, "ROLLBACK");
        return store_classify(rc);
    }
    return STORE_OK;
}

/* Confirms the file holds our tables, not another program's database.
   Returns STORE_OK or STORE_CORRUPT with *why. */
static int store_check_schema(sqlite3 *db, char **why)
{
    sqlite3_stmt *st = NULL;
    int ok = sqlite3_prepare_v2(db, "SELECT value FROM meta WHERE key = 'schema'", -1, &st, NULL) == SQLITE_OK
             && sqlite3_step(st) == SQLITE_ROW && sqlite3_column_text(st, 0)
             && strcmp((const char *)sqlite3_column_text(st, 0), STORE_SCHEMA) == 0;
    sqlite3_finalize(st);
    st = NULL;
    ok = ok && sqlite3_prepare_v2(db, "SELECT engine, question, answer, checksum FROM results LIMIT 0", -1, &st,
                                  NULL) == SQLITE_OK;
    sqlite3_finalize(st);
    if (!ok)
        *why = xstrdup("not a psikappa results store (unknown schema)");
    return ok ? STORE_OK : STORE_CORRUPT;
}

/* Opens path and checks it. Returns a state; *db is open (or NULL) either
   way, and *why explains any state other than STORE_OK. */
static int store_try_open(const char *path, sqlite3 **db, char **why)
{
    int rc = sqlite3_open_v2(path, db, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE, NULL);
    if (rc != SQLITE_OK) {
        *why = xstrdup(*db ? sqlite3_errmsg(*db) : sqlite3_errstr(rc));
        return STORE_FAILED;
    }
    /* several psikappa runs may share the file; wait for a writer a little */
    sqlite3_busy_timeout(*db, deadline_cap_ms(5000));   /* never past --time-limit */
    struct stat sb;
    int small = stat(path, &sb) != 0 || sb.st_size <= STORE_FULL_CHECK_BYTES;
    int state = small ? store_quick_check(*db, why) : STORE_OK;
    if (state == STORE_OK)
        state = store_create_schema(*db, why);
    if (state == STORE_OK)
        state = store_check_schema(*db, why);
    /* WAL with synchronous=NORMAL: a commit costs no fsync (the rollback
       journal's fsync per answer made 20000 answers take minutes), and the
       file stays consistent after a crash; only the newest answers may be
       lost, which a cache can afford. Left as is where WAL is unsupported. */
    if (state == STORE_OK) {
        store_exec(*db, "PRAGMA journal_mode=WAL");
        store_exec(*db, "PRAGMA synchronous=NORMAL");
    }
    return state;
}

/* Moves a damaged file to path.corrupt (kept for inspection, never deleted)
   and drops its journals, which belong to the old file. Returns 1 on success. */
static int store_move_aside(const char *path, char **aside)
{
    struct stat sb;
    if (stat(path, &sb) != 0 || !S_ISREG(sb.st_mode))
        return 0;
    *aside = xasprintf("%s.corrupt", path);
    if (rename(path, *aside) != 0)
        return 0;
    const char *suffix[] = {"-journal", "-wal", "-shm"};
    for (int i = 0; i < 3; i++) {
        char *j = xasprintf("%s%s", path, suffix[i]);
        unlink(j);
        free(j);
    }
    return 1;
}

/* Prepares the three statements used by get and put. Returns 1 on success. */
static int store_prepare(store *S)
{
    return sqlite3_prepare_v2(S->db, "SELECT answer, checksum FROM results WHERE engine = ?1 AND question = ?2", -1,
                              &S->get, NULL) == SQLITE_OK
           && sqlite3_prepare_v2(S->db,
                                 "INSERT OR REPLACE INTO results(engine, question, answer, checksum)"
                                 " VALUES(?1, ?2, ?3, ?4)",
                                 -1, &S->put, NULL) == SQLITE_OK
           && sqlite3_prepare_v2(S->db, "DELETE FROM results WHERE engine = ?1 AND question = ?2", -1, &S->del,
                                 NULL) == SQLITE_OK;
}

/* Opens, and on damage moves the file aside and starts afresh once.
   Returns the open database or NULL; *err carries the report. */
static sqlite3 *store_open_db(const char *path, char **err)
{
    sqlite3 *db = NULL;
    char *why = NULL, *aside = NULL;
    int state = store_try_open(path, &db, &why);
    if (state == STORE_CORRUPT) {
        sqlite3_close(db);
        db = NULL;
        if (store_move_aside(path, &aside)) {
            *err = xasprintf("results store %s was corrupt (%s); moved to %s and rebuilt", path, why, aside);
            free(why);
            why = NULL;
            state = store_try_open(path, &db, &why);
        }
    }
    if (state != STORE_OK) {
        free(*err);
        *err = xasprintf("cannot use results store %s: %s", path, why ? why : "damaged and cannot be moved aside");
        sqlite3_close(db);
        db = NULL;
    }
    free(why);
    free(aside);
    return db;
}

/* Makes the folders, opens or rebuilds the file, prepares the statements.
   Returns the handle (caller closes it) or NULL with *err (caller frees). */
store *store_open(const char *path, const char *engine_version, char **err)
{
    *err = NULL;
    if (!path || !path[0] || !engine_version) {
        *err = xstrdup("no path for the results store");
        return NULL;
    }
    if (!store_make_parents(path)) {
        *err = xasprintf("cannot create the folder of results store %s: %s", path, strerror(errno));
        return NULL;
    }
    sqlite3 *db = store_open_db(path, err);
    if (!db)
        return NULL;
    store *S = xcalloc(1, sizeof(store));
    S->db = db;
    S->version = xstrdup(engine_version);
    if (!store_prepare(S)) {
        free(*err);
        *err = xasprintf("cannot use results store %s: %s", path, sqlite3_errmsg(db));
        store_close(S);
        return NULL;
    }
    return S;
}

/* Binds the (engine, question) key to parameters 1 and 2 of st.
   SQLITE_STATIC: the strings outlive the statement's use. */
static void store_bind_key(store *S, sqlite3_stmt *st, const char *question)
{
    sqlite3_bind_text(st, 1, S->version, -1, SQLITE_STATIC);
    sqlite3_bind_text(st, 2, question, -1, SQLITE_STATIC);
}

/* Deletes the row of question after its checksum failed. */
static void store_drop(store *S, const char *question)
{
    store_bind_key(S, S->del, question);
    if (sqlite3_step(S->del) == SQLITE_DONE)
        S->dropped++;
    sqlite3_reset(S->del);
    sqlite3_clear_bindings(S->del);
}

/* Looks the question up under this engine version, checking the row.
   Returns 1 with a new *answer, or 0 (miss, damaged row, database error). */
int store_get(store *S, const char *question, char **answer)
{
    *answer = NULL;
    if (!S || !question)
        return 0;
    store_bind_key(S, S->get, question);
    int found = 0, bad = 0;
    if (sqlite3_step(S->get) == SQLITE_ROW) {
        const char *a = (const char *)sqlite3_column_text(S->get, 0);
        sqlite3_int64 sum = sqlite3_column_int64(S->get, 1);
        /* a NULL or non-integer field can only come from outside edits */
        if (a && sqlite3_column_type(S->get, 1) == SQLITE_INTEGER
            && sum == store_checksum_db(S->version, question, a)) {
            *answer = xstrdup(a);
            found = 1;
        } else {
            bad = 1;
        }
    }
    sqlite3_reset(S->get);
    sqlite3_clear_bindings(S->get);
    if (bad)
        store_drop(S, question);
    return found;
}

/* Writes (or replaces) the row with its checksum.
   Returns 1 when written; failures are not fatal to a cache. */
int store_put(store *S, const char *question, const char *answer)
{
    if (!S || !question || !answer)
        return 0;
    store_bind_key(S, S->put, question);
    sqlite3_bind_text(S->put, 3, answer, -1, SQLITE_STATIC);
    sqlite3_bind_int64(S->put, 4, store_checksum_db(S->version, question, answer));
    int ok = sqlite3_step(S->put) == SQLITE_DONE;
    sqlite3_reset(S->put);
    sqlite3_clear_bindings(S->put);
    return ok;
}

/* Rows dropped for a bad checksum since opening.
   0 for a NULL store. */
long store_dropped(const store *S)
{
    return S ? S->dropped : 0;
}

/* Finalises the statements and closes the file.
   S may be NULL; it is freed. */
void store_close(store *S)
{
    if (!S)
        return;
    sqlite3_finalize(S->get);
    sqlite3_finalize(S->put);
    sqlite3_finalize(S->del);
    sqlite3_close(S->db);
    free(S->version);
    free(S);
}
