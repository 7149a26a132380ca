/* A results store: exact answers to expensive questions, kept between runs in
   an embedded SQLite file so that a number computed once is looked up later.
   Rows are keyed by (engine version, question text); an answer computed by
   another version of the engine is never returned. Each row carries a 64-bit
   FNV-1a checksum of its key and answer, which catches damaged or hand-edited
   rows (it is not a defence against a deliberate forger).
   The store is a cache: every failure degrades to "not stored", never to a
   wrong answer. Ownership: store_open returns a handle the caller closes with
   store_close; *answer and *err strings are the caller's to free(). */
#ifndef PSIKAPPA_STORE_H
#define PSIKAPPA_STORE_H

#include <stddef.h>

typedef struct store store;

/* Opens (creating the directories, file and schema as needed) the store at
   path for answers of engine_version. A damaged file (not a database, failing
   PRAGMA quick_check, or a foreign schema) is moved aside to path.corrupt and
   rebuilt, and *err says so; the handle is still returned. Returns NULL with
   *err set only when no usable store can be made at all. *err is NULL when
   there is nothing to report. */
store *store_open(const char *path, const char *engine_version, char **err);

/* Looks up question. Returns 1 on a hit (*answer is a new string), 0 on a miss
   (*answer NULL). A row whose checksum fails is deleted and counted as a miss;
   database errors are misses too. S may be NULL (always a miss). */
int store_get(store *S, const char *question, char **answer);

/* Records answer for question, replacing an older answer. Returns 1 when the
   row was written, 0 otherwise (S NULL, or a database error). */
int store_put(store *S, const char *question, const char *answer);

/* Number of rows dropped by store_get for a failed checksum since opening. */
long store_dropped(const store *S);

/* Closes the database and frees S (NULL allowed). */
void store_close(store *S);

/* Writes the default location into buf: $XDG_CACHE_HOME/psikappa/results.sqlite
   when XDG_CACHE_HOME is an absolute path, else ~/.cache/psikappa/results.sqlite.
   Returns buf, or NULL when HOME is unknown or buf is too small. */
const char *store_default_path(char *buf, size_t len);

/* The checksum of a row (exposed for tests): FNV-1a 64 over version, question
   and answer, each followed by a NUL byte so that fields cannot slide. */
unsigned long long store_checksum(const char *version, const char *question, const char *answer);

#endif
