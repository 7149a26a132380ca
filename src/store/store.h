/* A results store: exact answers to expensive questions, kept between runs in
   an embedded SQLite file so that a number computed once is looked up later.

   Identity: the file carries PRAGMA application_id STORE_APPLICATION_ID and
   user_version STORE_FORMAT. The store only ever uses a file it created (an
   empty file, or a missing one it creates itself) or one carrying that
   identity; anything else (another program's database, a file that is not an
   SQLite database, a device, a folder, a pipe) is refused and left untouched.

   Rows are keyed by (engine version, key): the key is a hash of a canonical
   serialisation of the question (results_key.h), so an answer computed by
   another engine version is never returned. Each row carries a SHA-256 of its
   engine, key and answer, which catches damaged or hand-edited rows.

   Damage (a failed integrity check at opening, a file shorter than its header
   says, SQLITE_CORRUPT while reading, failed row checksums) is reported; a
   damaged file is moved aside under a new name PATH.damaged-N (never
   overwriting an earlier one; its journals go with it) and a new store is
   started. The store is a cache: every failure degrades to "not stored",
   never to a wrong answer.

   Ownership: store_open returns a handle the caller closes with store_close;
   *answer, *err and notes are the caller's to free(). */
#ifndef PSIKAPPA_STORE_H
#define PSIKAPPA_STORE_H

#include <stddef.h>

/* "psk1" read as a big-endian 32-bit number. */
#define STORE_APPLICATION_ID 0x70736b31
#define STORE_FORMAT 2

typedef struct store store;

/* Opens (creating the folders, file and tables as needed) the store at path
   for answers of engine_version. Returns NULL with *err set when no usable
   store can be had (refused or unusable file); otherwise the handle, with *err
   set when there is something to report (a damaged file moved aside). */
store *store_open(const char *path, const char *engine_version, char **err);

/* Looks up key. Returns 1 on a hit (*answer is a new string), 0 on a miss
   (*answer NULL). A row whose checksum fails is deleted and counted as a miss;
   a damaged file is moved aside and replaced (see store_take_note); other
   database errors are misses. S may be NULL (always a miss). */
int store_get(store *S, const char *key, char **answer);

/* Records answer for key, replacing an older answer; label is a short text
   for people reading the file (never used to look anything up). Returns 1
   when the row was written, 0 otherwise (S NULL, or a database error, which
   is reported once through store_take_note). */
int store_put(store *S, const char *key, const char *label, const char *answer);

/* Makes the calls up to store_end one transaction that no other process's writes can
   interleave with (SQLite's BEGIN IMMEDIATE, waiting as long as any write would): for a
   read-modify-write over several rows, such as a table and its index. Returns 1 when the
   transaction began, 0 otherwise (S NULL, no file, or the lock not had in time: the caller
   goes on without it, as before). Not nested. */
int store_begin(store *S);

/* Commits what store_begin began (rolled back if the commit fails; nothing to do when a
   damaged file was replaced in between). S may be NULL. */
void store_end(store *S);

/* A message about something that happened since the last call (damage found
   and moved aside, rows dropped, writes failing), or NULL. Caller frees. */
char *store_take_note(store *S);

/* Number of rows dropped by store_get for a failed checksum since opening. */
long store_dropped(const store *S);

/* Closes the database and frees S (NULL allowed). */
void store_close(store *S);

/* Writes the default location into buf: $XDG_CACHE_HOME/psikappa/results.sqlite
   when XDG_CACHE_HOME is an absolute path, else ~/.cache/psikappa/results.sqlite.
   Returns buf, or NULL when HOME is unknown or buf is too small. */
const char *store_default_path(char *buf, size_t len);

/* The checksum of a row (exposed for tests): SHA-256 over version, key and
   answer, each followed by a NUL byte so that fields cannot slide; 64 hex
   digits in hex. */
void store_checksum(const char *version, const char *key, const char *answer, char hex[65]);

#endif
