#include "store_file.h"
#include "deadline.h"

#include <errno.h>
#include <fcntl.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "store.h"
#include "util.h"

/* The contents of the meta table's schema row, checked besides the identity. */
#define STORE_SCHEMA "psikappa-results-2"
/* The schema row of the first format, which had no application id. */
#define STORE_SCHEMA_1 "psikappa-results-1"

/* PRAGMA quick_check reads every page (measured: about 12 ms per MiB), a cost
   a calculator started many times a minute should not pay on a large store.
   Above this size damage is found by the header check at opening, when a page
   is read (SQLITE_CORRUPT) and by the row checksums. */
#define STORE_FULL_CHECK_BYTES (4L << 20)

/* What the first bytes of an existing file say it is. */
enum { HDR_OURS, HDR_FIRST_FORMAT, HDR_FOREIGN, HDR_UNKNOWN, HDR_SHORT, HDR_FAILED };

static const char *const store_sides[] = {"-wal", "-journal", "-shm"};

int store_file_is_damage(int rc)
{
    rc &= 0xff;
    return rc == SQLITE_NOTADB || rc == SQLITE_CORRUPT || rc == SQLITE_FORMAT;
}

void store_file_close_damaged(sqlite3 *db)
{
    if (db)
        sqlite3_db_config(db, SQLITE_DBCONFIG_NO_CKPT_ON_CLOSE, 1, (int *)NULL);
    sqlite3_close(db);
}

static const char *store_file_type(mode_t m)
{
    return S_ISDIR(m) ? "a folder" : S_ISCHR(m) || S_ISBLK(m) ? "a device" : S_ISFIFO(m) ? "a pipe"
           : S_ISSOCK(m) ? "a socket" : "not a regular file";
}

/* Checks the path and its journal names before anything opens them. Returns
   1 for a regular file (*id set), 0 when missing, -1 with *why otherwise. */
static int store_file_check_kind(const char *path, struct stat *id, char **why)
{
    for (int i = 0; i < 3; i++) {
        struct stat sb;
        char *side = xasprintf("%s%s", path, store_sides[i]);
        int bad = stat(side, &sb) == 0 && !S_ISREG(sb.st_mode);
        if (bad)
            *why = xasprintf("refused: %s is %s, not a journal of a results store", side, store_file_type(sb.st_mode));
        free(side);
        if (bad)
            return -1;
    }
    if (stat(path, id) != 0) {
        struct stat link;
        if (errno == ENOENT && lstat(path, &link) == 0) {
            *why = xstrdup("refused: it is a symbolic link to nothing");
            return -1;
        }
        if (errno == ENOENT)
            return 0;
        *why = xasprintf("cannot examine it: %s", strerror(errno));
        return -1;
    }
    if (!S_ISREG(id->st_mode)) {
        *why = xasprintf("refused: it is %s, not a results store file", store_file_type(id->st_mode));
        return -1;
    }
    return 1;
}

/* Reads the first 100 bytes and the size through SQLite's own file layer:
   closing a descriptor of our own would drop the locks SQLite connections of
   this process hold on the file. Returns an SQLite result code. */
static int store_file_read_header(const char *path, unsigned char hdr[100], sqlite3_int64 *size)
{
    sqlite3_vfs *vfs = sqlite3_vfs_find(NULL);
    if (!vfs)
        return SQLITE_ERROR;
    sqlite3_file *f = sqlite3_malloc(vfs->szOsFile);
    if (!f)
        return SQLITE_NOMEM;
    memset(f, 0, (size_t)vfs->szOsFile);
    int out = 0, rc = vfs->xOpen(vfs, path, f, SQLITE_OPEN_MAIN_DB | SQLITE_OPEN_READONLY, &out);
    if (rc == SQLITE_OK) {
        rc = f->pMethods->xFileSize(f, size);
        memset(hdr, 0, 100);
        if (rc == SQLITE_OK && *size >= 100)
            rc = f->pMethods->xRead(f, hdr, 100, 0);
    }
    if (f->pMethods)
        f->pMethods->xClose(f);
    sqlite3_free(f);
    return rc;
}

static uint32_t store_be32(const unsigned char *p)
{
    return (uint32_t)p[0] << 24 | (uint32_t)p[1] << 16 | (uint32_t)p[2] << 8 | p[3];
}

/* Whether a journal or log with contents lies beside path (the header's page
   count may then be ahead of the file until recovery). */
static int store_file_has_log(const char *path)
{
    int found = 0;
    for (int i = 0; i < 2 && !found; i++) {
        struct stat sb;
        char *side = xasprintf("%s%s", path, store_sides[i]);
        found = stat(side, &sb) == 0 && sb.st_size > 0;
        free(side);
    }
    return found;
}

/* A file shorter than the page count its header declares was truncated.
   Returns 1 (with *why) for such a file. */
static int store_file_truncated(const char *path, const unsigned char *hdr, sqlite3_int64 size, char **why)
{
    sqlite3_int64 page = hdr[16] << 8 | hdr[17];
    if (page == 1)
        page = 65536;
    uint32_t pages = store_be32(hdr + 28);
    int valid = pages > 0 && store_be32(hdr + 24) == store_be32(hdr + 92);
    if (!valid || size >= (sqlite3_int64)pages * page || store_file_has_log(path))
        return 0;
    *why = xasprintf("the file has %lld bytes, its header says %lld", (long long)size, (long long)pages * page);
    return 1;
}

/* A file: URI for path, every byte outside the unreserved set %-escaped. */
static char *store_file_uri(const char *path)
{
    static const char hex[] = "0123456789ABCDEF";
    char *u = xmalloc(5 + 3 * strlen(path) + 1), *q = u;
    memcpy(q, "file:", 5);
    q += 5;
    for (const unsigned char *p = (const unsigned char *)path; *p; p++) {
        if ((*p >= 'a' && *p <= 'z') || (*p >= 'A' && *p <= 'Z') || (*p >= '0' && *p <= '9') || strchr("/._-~", *p)) {
            *q++ = (char)*p;
        } else {
            *q++ = '%';
            *q++ = hex[*p >> 4];
            *q++ = hex[*p & 15];
        }
    }
    *q = '\0';
    return u;
}

/* Whether a database without application id is a store of the first format
   (which had none). Opened immutable: no lock, no journal, nothing written. */
static int store_file_is_first_format(const char *path)
{
    char *uri = store_file_uri(path), *full = xasprintf("%s?immutable=1", uri);
    sqlite3 *db = NULL;
    sqlite3_stmt *st = NULL;
    int yes = sqlite3_open_v2(full, &db, SQLITE_OPEN_READONLY | SQLITE_OPEN_URI, NULL) == SQLITE_OK
              && sqlite3_prepare_v2(db, "SELECT value FROM meta WHERE key = 'schema'", -1, &st, NULL) == SQLITE_OK
              && sqlite3_step(st) == SQLITE_ROW && sqlite3_column_text(st, 0)
              && strcmp((const char *)sqlite3_column_text(st, 0), STORE_SCHEMA_1) == 0;
    sqlite3_finalize(st);
    sqlite3_close(db);
    free(uri);
    free(full);
    return yes;
}

/* Classifies an existing regular file by its header (see HDR_*); *why is set
   for HDR_FOREIGN, HDR_UNKNOWN, HDR_SHORT and HDR_FAILED. */
static int store_file_classify(const char *path, sqlite3_int64 *size, char **why)
{
    unsigned char hdr[100];
    int rc = store_file_read_header(path, hdr, size);
    if (rc != SQLITE_OK) {
        *why = xasprintf("cannot read it: %s", sqlite3_errstr(rc));
        return HDR_FAILED;
    }
    if (*size == 0) {
        /* a store is never empty: it is made elsewhere and renamed into place */
        *why = xstrdup("refused: it is an empty file psikappa did not make; it was left untouched (remove it "
                       "to have a store made there)");
        return HDR_UNKNOWN;
    }
    if (*size < 100 || memcmp(hdr, "SQLite format 3", 16) != 0) {
        *why = xstrdup("refused: it is not a psikappa results store (not an SQLite database); it was left "
                       "untouched (remove it or choose another file)");
        return HDR_UNKNOWN;
    }
    uint32_t app = store_be32(hdr + 68);
    if (app == STORE_APPLICATION_ID && store_be32(hdr + 60) > STORE_FORMAT) {
        *why = xasprintf("refused: written by a newer psikappa (format %lu, this one reads %d); left untouched",
                         (unsigned long)store_be32(hdr + 60), STORE_FORMAT);
        return HDR_FOREIGN;
    }
    if (app == STORE_APPLICATION_ID)
        return store_file_truncated(path, hdr, *size, why) ? HDR_SHORT : HDR_OURS;
    if (app == 0 && store_file_is_first_format(path))
        return HDR_FIRST_FORMAT;
    *why = xasprintf("refused: it is an SQLite database of another program (application id 0x%08lx), not a "
                     "psikappa results store; it was left untouched",
                     (unsigned long)app);
    return HDR_FOREIGN;
}

/* Runs SQL without results; returns the SQLite result code and sets *why on failure. */
static int store_file_exec(sqlite3 *db, const char *sql, char **why)
{
    int rc = sqlite3_exec(db, sql, NULL, NULL, NULL);
    if (rc != SQLITE_OK && why && !*why)
        *why = xstrdup(sqlite3_errmsg(db));
    return rc;
}

/* One integer from a pragma or query; -1 on failure. */
static long long store_file_int(sqlite3 *db, const char *sql)
{
    sqlite3_stmt *st = NULL;
    long long v = -1;
    if (sqlite3_prepare_v2(db, sql, -1, &st, NULL) == SQLITE_OK && sqlite3_step(st) == SQLITE_ROW)
        v = sqlite3_column_int64(st, 0);
    sqlite3_finalize(st);
    return v;
}

/* Puts the finished file tmp at path unless something is there already (a
   hard link cannot replace; where the file system has none, a rename after a
   check). Returns 1, 0 when path exists, -1 with *why. */
static int store_file_link(const char *tmp, const char *path, char **why)
{
    if (link(tmp, path) == 0)
        return 1;
    if (errno == EEXIST)
        return 0;
    struct stat sb;
    if (errno != EPERM && errno != ENOTSUP && errno != EXDEV)
        return *why = xasprintf("cannot create it: %s", strerror(errno)), -1;
    if (lstat(path, &sb) == 0)
        return 0;
    if (rename(tmp, path) != 0)
        return *why = xasprintf("cannot create it: %s", strerror(errno)), -1;
    return 1;
}

/* Writes identity and tables (dropping those of an older format) in one
   transaction; when another process made them first, leaves them. Returns an
   SQLite result code. */
static int store_file_make_tables(sqlite3 *db, int fresh, char **why)
{
    char sql[1024];
    snprintf(sql, sizeof sql,
             "PRAGMA application_id = %d; PRAGMA user_version = %d;"
             "DROP TABLE IF EXISTS results; DROP TABLE IF EXISTS meta;"
             "CREATE TABLE meta(key TEXT PRIMARY KEY, value TEXT NOT NULL);"
             "INSERT INTO meta(key, value) VALUES('schema', '" STORE_SCHEMA "');"
             "CREATE TABLE results(engine TEXT NOT NULL, key TEXT NOT NULL, label TEXT NOT NULL,"
             " answer TEXT NOT NULL, checksum TEXT NOT NULL, PRIMARY KEY(engine, key));",
             STORE_APPLICATION_ID, STORE_FORMAT);
    int rc = store_file_exec(db, "BEGIN IMMEDIATE", why);
    if (rc != SQLITE_OK)
        return rc;
    long long tables = store_file_int(db, "SELECT count(*) FROM sqlite_master");
    long long app = store_file_int(db, "PRAGMA application_id");
    int made_by_other = fresh && tables > 0 && app == STORE_APPLICATION_ID;
    if (fresh && tables != 0 && !made_by_other) {
        store_file_exec(db, "ROLLBACK", NULL);
        *why = xstrdup("refused: another program wrote a database into the new file");
        return SQLITE_MISMATCH;
    }
    rc = made_by_other ? SQLITE_OK : store_file_exec(db, sql, why);
    if (rc == SQLITE_OK)
        rc = store_file_exec(db, "COMMIT", why);
    if (rc != SQLITE_OK)
        store_file_exec(db, "ROLLBACK", NULL);
    return rc;
}

/* One line out of SQLite's integrity report, which may list dozens of
   follow-on problems after a "*** in database main ***" heading. */
static char *store_file_first_problem(const char *report)
{
    const char *s = report ? report : "no answer";
    if (strncmp(s, "***", 3) == 0 && strchr(s, '\n'))
        s = strchr(s, '\n') + 1;
    size_t n = strcspn(s, "\n");
    return xasprintf("integrity check: %.*s", (int)n, s);
}

/* PRAGMA quick_check (every page is read). Returns SF_OK, SF_DAMAGED or
   SF_FAILED with *why. */
static int store_file_quick_check(sqlite3 *db, char **why)
{
    sqlite3_stmt *st = NULL;
    int rc = sqlite3_prepare_v2(db, "PRAGMA quick_check(1)", -1, &st, NULL);
    if (rc == SQLITE_OK)
        rc = sqlite3_step(st);
    int state = SF_OK;
    if (rc == SQLITE_ROW) {
        const char *r = (const char *)sqlite3_column_text(st, 0);
        if (!r || strcmp(r, "ok") != 0) {
            state = SF_DAMAGED;
            *why = store_file_first_problem(r);
        }
    } else {
        state = store_file_is_damage(rc) ? SF_DAMAGED : SF_FAILED;
        *why = xstrdup(sqlite3_errmsg(db));
    }
    sqlite3_finalize(st);
    return state;
}

/* Our identity, our format (upgrading an older one) and our tables. Returns
   SF_OK, SF_DAMAGED, SF_REFUSED or SF_FAILED with *why. */
static int store_file_verify(sqlite3 *db, char **why)
{
    long long app = store_file_int(db, "PRAGMA application_id");
    long long format = store_file_int(db, "PRAGMA user_version");
    if (app != STORE_APPLICATION_ID) {
        *why = xstrdup(app < 0 ? sqlite3_errmsg(db) : "refused: the file changed while it was being opened");
        return app < 0 ? SF_FAILED : SF_REFUSED;
    }
    if (format > STORE_FORMAT) {
        *why = xasprintf("refused: written by a newer psikappa (format %lld, this one reads %d); left untouched",
                         format, STORE_FORMAT);
        return SF_REFUSED;
    }
    if (format < STORE_FORMAT) {
        int rc = store_file_make_tables(db, 0, why);
        if (rc != SQLITE_OK)
            return store_file_is_damage(rc) ? SF_DAMAGED : SF_FAILED;
    }
    sqlite3_stmt *st = NULL;
    int ok = sqlite3_prepare_v2(db, "SELECT value FROM meta WHERE key = 'schema'", -1, &st, NULL) == SQLITE_OK
             && sqlite3_step(st) == SQLITE_ROW && sqlite3_column_text(st, 0)
             && strcmp((const char *)sqlite3_column_text(st, 0), STORE_SCHEMA) == 0;
    sqlite3_finalize(st);
    st = NULL;
    ok = ok && sqlite3_prepare_v2(db, "SELECT engine, key, label, answer, checksum FROM results LIMIT 0", -1, &st,
                                  NULL) == SQLITE_OK;
    sqlite3_finalize(st);
    if (!ok)
        *why = xstrdup("its tables are missing or altered");
    return ok ? SF_OK : SF_DAMAGED;
}

/* Opens the regular file at path with SQLite (never creating it) and brings
   it to a checked state: tables made in an empty or first-format file, our
   file checked. Returns an SF_ state; *db stays open only on SF_OK. */
static int store_file_open_checked(const char *path, int kind, sqlite3_int64 size, sqlite3 **db, char **why)
{
    int rc = sqlite3_open_v2(path, db, SQLITE_OPEN_READWRITE, NULL);
    int state = SF_OK;
    if (rc != SQLITE_OK) {
        *why = xstrdup(*db ? sqlite3_errmsg(*db) : sqlite3_errstr(rc));
        state = SF_FAILED;
    } else {
        /* several psikappa runs may share the file; wait for a writer a little */
        sqlite3_busy_timeout(*db, deadline_cap_ms(5000));   /* never past --time-limit */
        if (kind == HDR_FIRST_FORMAT) {
            rc = store_file_make_tables(*db, 0, why);
            state = rc == SQLITE_OK ? SF_OK : rc == SQLITE_MISMATCH ? SF_REFUSED
                    : store_file_is_damage(rc) ? SF_DAMAGED : SF_FAILED;
        } else if (size <= STORE_FULL_CHECK_BYTES) {
            state = store_file_quick_check(*db, why);
        }
        if (state == SF_OK)
            state = store_file_verify(*db, why);
    }
    /* WAL with synchronous=NORMAL: a commit costs no fsync (the rollback
       journal's fsync per answer made 20000 answers take minutes), and the
       file stays consistent after a crash; only the newest answers may be
       lost, which a cache can afford. Left as is where WAL is unsupported. */
    if (state == SF_OK) {
        sqlite3_exec(*db, "PRAGMA journal_mode=WAL", NULL, NULL, NULL);
        sqlite3_exec(*db, "PRAGMA synchronous=NORMAL", NULL, NULL, NULL);
        /* one answer per commit: a log folded back every 200 pages stays
           under a MiB instead of the default 4 */
        sqlite3_exec(*db, "PRAGMA wal_autocheckpoint=200", NULL, NULL, NULL);
    } else {
        store_file_close_damaged(*db);
        *db = NULL;
    }
    return state;
}

/* Makes a new store under a temporary name beside path and links it into
   place, so that the path never holds a half-made store (an empty file at the
   path is then never ours). Returns 1 when made, 0 when another run made one
   first, -1 with *why on failure. */
static int store_file_create(const char *path, char **why)
{
    char *tmp = NULL;
    int fd = -1;
    for (int n = 0; n < 100 && fd < 0; n++) {
        free(tmp);
        tmp = xasprintf("%s.new-%ld-%d", path, (long)getpid(), n);
        fd = open(tmp, O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC, 0600);
        if (fd < 0 && errno != EEXIST)
            break;
    }
    if (fd < 0) {
        *why = xasprintf("cannot create it: %s", strerror(errno));
        free(tmp);
        return -1;
    }
    close(fd);
    sqlite3 *db = NULL;
    int rc = sqlite3_open_v2(tmp, &db, SQLITE_OPEN_READWRITE, NULL);
    rc = rc == SQLITE_OK ? store_file_make_tables(db, 1, why) : rc;
    if (rc != SQLITE_OK && !*why)
        *why = xstrdup(sqlite3_errstr(rc));
    rc = sqlite3_close(db) == SQLITE_OK ? rc : SQLITE_ERROR;
    int made = rc == SQLITE_OK ? store_file_link(tmp, path, why) : -1;
    if (made < 0 && !*why)
        *why = xasprintf("cannot create it: %s", sqlite3_errstr(rc));
    unlink(tmp);
    free(tmp);
    return made;
}

int store_file_open(const char *path, sqlite3 **db, struct stat *id, char **why)
{
    *db = NULL;
    int exists = store_file_check_kind(path, id, why), made = 0;
    for (int tries = 0; exists == 0 && tries < 3; tries++) {
        made = store_file_create(path, why);
        exists = made < 0 ? -1 : store_file_check_kind(path, id, why);
    }
    if (exists <= 0) {
        if (!*why)
            *why = xstrdup("the file keeps disappearing");
        return exists < 0 && strncmp(*why, "refused", 7) == 0 ? SF_REFUSED : SF_FAILED;
    }
    sqlite3_int64 size = 0;
    int kind = store_file_classify(path, &size, why);
    switch (kind) {
    case HDR_SHORT:
        return SF_DAMAGED;
    case HDR_FOREIGN:
    case HDR_UNKNOWN:
        return SF_REFUSED;
    case HDR_FAILED:
        return SF_FAILED;
    default:
        return store_file_open_checked(path, kind, size, db, why);
    }
}

/* Reserves name (and its -wal and -journal names) by creating them empty
   and exclusively. Returns 1, or 0 after undoing a partial reservation. */
static int store_file_reserve(const char *name)
{
    int made[3] = {0, 0, 0}, ok = 1;
    for (int i = 0; i < 3 && ok; i++) {
        char *n = i == 0 ? xstrdup(name) : xasprintf("%s%s", name, store_sides[i - 1]);
        int fd = open(n, O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC, 0600);
        if (fd >= 0) {
            close(fd);
            made[i] = 1;
        } else {
            ok = 0;
        }
        free(n);
    }
    for (int i = 0; i < 3 && !ok; i++) {
        char *n = i == 0 ? xstrdup(name) : xasprintf("%s%s", name, store_sides[i - 1]);
        if (made[i])
            unlink(n);
        free(n);
    }
    return ok;
}

/* Moves path+suffix onto aside+suffix (a reserved empty file), or removes the
   reservation when there is nothing to move. Returns 0 when a move failed. */
static int store_file_move_side(const char *path, const char *aside, const char *suffix)
{
    char *from = xasprintf("%s%s", path, suffix), *to = xasprintf("%s%s", aside, suffix);
    struct stat sb;
    int ok = 1;
    if (stat(from, &sb) == 0)
        ok = rename(from, to) == 0;
    else
        unlink(to);
    free(from);
    free(to);
    return ok;
}

char *store_file_move_aside(const char *path, const struct stat *id, char **why)
{
    struct stat now;
    if (stat(path, &now) != 0 || now.st_dev != id->st_dev || now.st_ino != id->st_ino) {
        *why = xstrdup("another run replaced it already");
        return NULL;
    }
    char *aside = NULL;
    for (int n = 1; n < 10000 && !aside; n++) {
        aside = xasprintf("%s.damaged-%d", path, n);
        if (!store_file_reserve(aside)) {
            free(aside);
            aside = NULL;
        }
    }
    if (!aside || rename(path, aside) != 0) {
        *why = xasprintf("cannot move it aside: %s", aside ? strerror(errno) : "no free name");
        free(aside);
        return NULL;
    }
    /* the journals hold part of the damaged file's contents: they go with it */
    int ok = store_file_move_side(path, aside, "-wal") & store_file_move_side(path, aside, "-journal");
    char *shm = xasprintf("%s-shm", path);
    unlink(shm); /* an index of the log, rebuilt from the log when needed */
    free(shm);
    if (!ok) {
        *why = xasprintf("moved to %s, but a journal beside it could not follow: %s", aside, strerror(errno));
        free(aside);
        return NULL;
    }
    return aside;
}
