#include "store.h"

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include <sqlite3.h>

#include "sha256.h"
#include "store_file.h"
#include "util.h"

struct store {
    sqlite3 *db;
    char *path, *version;           /* owned */
    struct stat id;                 /* the file opened (device, inode) */
    sqlite3_stmt *get, *put, *del;  /* prepared once, owned */
    long dropped;                   /* rows deleted for a bad checksum */
    char *note;                     /* pending message, owned */
    int write_failed_told;          /* a failed write was reported already */
    int recoveries;                 /* damaged files replaced during this run */
};

void store_checksum(const char *version, const char *key, const char *answer, char hex[65])
{
    sha256_ctx h;
    sha256_init(&h);
    sha256_update_field(&h, version ? version : "");
    sha256_update_field(&h, key ? key : "");
    sha256_update_field(&h, answer ? answer : "");
    sha256_final_hex(&h, hex);
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

/* Appends a sentence to the pending note. */
static void store_add_note(store *S, char *text)
{
    if (S->note) {
        char *both = xasprintf("%s; %s", S->note, text);
        free(S->note);
        free(text);
        text = both;
    }
    S->note = text;
}

/* Opens the file, and when it is damaged moves it aside and starts a new one
   (at most twice). Returns the database or NULL; *note gets what to report. */
static sqlite3 *store_open_db(const char *path, struct stat *id, char **note)
{
    sqlite3 *db = NULL;
    for (int round = 0; round < 3; round++) {
        char *why = NULL;
        int state = store_file_open(path, &db, id, &why);
        if (state == SF_OK) {
            free(why);
            return db;
        }
        char *aside = state == SF_DAMAGED ? store_file_move_aside(path, id, &why) : NULL;
        char *msg = state == SF_REFUSED && strncmp(why, "refused: ", 9) == 0
                        ? xasprintf("refused results store %s: %s", path, why + 9)
                    : state != SF_DAMAGED ? xasprintf("cannot use results store %s: %s", path, why)
                    : aside ? xasprintf("results store %s was damaged (%s); kept as %s and started afresh", path,
                                        why, aside)
                            : xasprintf("results store %s is damaged and was not used: %s", path, why);
        free(why);
        char *joined = *note ? xasprintf("%s; %s", *note, msg) : msg;
        if (joined != msg)
            free(msg);
        free(*note);
        *note = joined;
        if (!aside)
            return NULL;
        free(aside);
    }
    return NULL;
}

/* Prepares the three statements used by get and put. Returns 1 on success. */
static int store_prepare(store *S)
{
    return sqlite3_prepare_v2(S->db, "SELECT answer, checksum FROM results WHERE engine = ?1 AND key = ?2", -1,
                              &S->get, NULL) == SQLITE_OK
           && sqlite3_prepare_v2(S->db,
                                 "INSERT OR REPLACE INTO results(engine, key, label, answer, checksum)"
                                 " VALUES(?1, ?2, ?3, ?4, ?5)",
                                 -1, &S->put, NULL) == SQLITE_OK
           && sqlite3_prepare_v2(S->db, "DELETE FROM results WHERE engine = ?1 AND key = ?2", -1, &S->del,
                                 NULL) == SQLITE_OK;
}

/* Finalises the statements and closes the database (keeping S). */
static void store_shut(store *S, int damaged)
{
    sqlite3_finalize(S->get);
    sqlite3_finalize(S->put);
    sqlite3_finalize(S->del);
    S->get = S->put = S->del = NULL;
    if (damaged)
        store_file_close_damaged(S->db);
    else
        sqlite3_close(S->db);
    S->db = NULL;
}

/* Opens S->path into S. Returns 1, or 0 with the reason in S->note. */
static int store_attach(store *S)
{
    char *note = NULL;
    S->db = store_open_db(S->path, &S->id, &note);
    if (note)
        store_add_note(S, note);
    if (S->db && !store_prepare(S)) {
        store_add_note(S, xasprintf("cannot use results store %s: %s", S->path, sqlite3_errmsg(S->db)));
        store_shut(S, 0);
    }
    return S->db != NULL;
}

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
    store *S = xcalloc(1, sizeof(store));
    S->path = xstrdup(path);
    S->version = xstrdup(engine_version);
    int ok = store_attach(S);
    *err = store_take_note(S);
    if (!ok) {
        store_close(S);
        return NULL;
    }
    return S;
}

/* Damage found while reading or writing: the file is moved aside and a new
   one started (once per run; a second time the store is left off). */
static void store_recover(store *S, int rc)
{
    char *why = xstrdup(sqlite3_errstr(rc));
    store_shut(S, 1);
    char *aside = S->recoveries++ == 0 ? store_file_move_aside(S->path, &S->id, &why) : NULL;
    if (aside) {
        store_add_note(S, xasprintf("results store %s was damaged (%s); kept as %s and started afresh", S->path,
                                    why, aside));
        store_attach(S);
    } else {
        store_add_note(S, xasprintf("results store %s is damaged (%s); not used for the rest of this run", S->path,
                                    why));
    }
    free(aside);
    free(why);
}

/* Binds the (engine, key) pair to parameters 1 and 2 of st.
   SQLITE_STATIC: the strings outlive the statement's use. */
static void store_bind_key(store *S, sqlite3_stmt *st, const char *key)
{
    sqlite3_bind_text(st, 1, S->version, -1, SQLITE_STATIC);
    sqlite3_bind_text(st, 2, key, -1, SQLITE_STATIC);
}

/* Deletes the row of key after its checksum failed, and says so once. */
static void store_drop(store *S, const char *key)
{
    store_bind_key(S, S->del, key);
    if (sqlite3_step(S->del) == SQLITE_DONE && S->dropped++ == 0)
        store_add_note(S, xasprintf("results store %s held a damaged answer; it was dropped and is computed "
                                    "again", S->path));
    sqlite3_reset(S->del);
    sqlite3_clear_bindings(S->del);
}

/* Checks a fetched row: the answer and the checksum over version, key, answer. */
static int store_row_ok(store *S, const char *key, const char *answer, sqlite3_stmt *st)
{
    const char *sum = (const char *)sqlite3_column_text(st, 1);
    if (!answer || !sum || sqlite3_column_type(st, 1) != SQLITE_TEXT)
        return 0;
    char want[65];
    store_checksum(S->version, key, answer, want);
    return strcmp(sum, want) == 0;
}

int store_get(store *S, const char *key, char **answer)
{
    *answer = NULL;
    if (!S || !S->db || !key)
        return 0;
    store_bind_key(S, S->get, key);
    int rc = sqlite3_step(S->get), found = 0, bad = 0;
    if (rc == SQLITE_ROW) {
        const char *a = (const char *)sqlite3_column_text(S->get, 0);
        if (store_row_ok(S, key, a, S->get)) {
            *answer = xstrdup(a);
            found = 1;
        } else {
            bad = 1;
        }
    }
    sqlite3_reset(S->get);
    sqlite3_clear_bindings(S->get);
    if (bad)
        store_drop(S, key);
    else if (rc != SQLITE_ROW && store_file_is_damage(rc))
        store_recover(S, rc);
    return found;
}

int store_put(store *S, const char *key, const char *label, const char *answer)
{
    if (!S || !S->db || !key || !answer)
        return 0;
    char sum[65];
    store_checksum(S->version, key, answer, sum);
    store_bind_key(S, S->put, key);
    sqlite3_bind_text(S->put, 3, label ? label : "", -1, SQLITE_STATIC);
    sqlite3_bind_text(S->put, 4, answer, -1, SQLITE_STATIC);
    sqlite3_bind_text(S->put, 5, sum, -1, SQLITE_STATIC);
    int rc = sqlite3_step(S->put);
    char *why = rc == SQLITE_DONE ? NULL : xstrdup(sqlite3_errmsg(S->db));
    sqlite3_reset(S->put);
    sqlite3_clear_bindings(S->put);
    if (rc != SQLITE_DONE && store_file_is_damage(rc)) {
        store_recover(S, rc);
    } else if (rc != SQLITE_DONE && !S->write_failed_told) {
        S->write_failed_told = 1;
        store_add_note(S, xasprintf("results store %s cannot keep new answers (%s); they are computed but not "
                                    "stored",
                                    S->path, why));
    }
    free(why);
    return rc == SQLITE_DONE;
}

int store_begin(store *S)
{
    return S && S->db && sqlite3_exec(S->db, "BEGIN IMMEDIATE", NULL, NULL, NULL) == SQLITE_OK;
}

void store_end(store *S)
{
    if (!S || !S->db || sqlite3_get_autocommit(S->db))
        return;
    if (sqlite3_exec(S->db, "COMMIT", NULL, NULL, NULL) != SQLITE_OK)
        sqlite3_exec(S->db, "ROLLBACK", NULL, NULL, NULL);
}

char *store_take_note(store *S)
{
    if (!S)
        return NULL;
    char *n = S->note;
    S->note = NULL;
    return n;
}

long store_dropped(const store *S)
{
    return S ? S->dropped : 0;
}

void store_close(store *S)
{
    if (!S)
        return;
    if (S->db)
        store_shut(S, 0);
    free(S->path);
    free(S->version);
    free(S->note);
    free(S);
}
