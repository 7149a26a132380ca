/* The file behind the results store (store.c only): what is at the path
   before SQLite is allowed near it, opening and checking it, creating the
   tables, and moving a damaged file aside. Messages are new strings the
   caller frees. */
#ifndef PSIKAPPA_STORE_FILE_H
#define PSIKAPPA_STORE_FILE_H

#include <sys/stat.h>

#include <sqlite3.h>

/* What store_file_open found. */
enum {
    SF_OK,        /* an open, checked store */
    SF_DAMAGED,   /* our file, damaged: *why says how; move it aside */
    SF_REFUSED,   /* not ours (or not a regular file): *why says what it is */
    SF_FAILED     /* could not be opened or created: *why says why */
};

/* Opens the store at path: creates the file when missing, refuses anything
   that is not an empty file or a file with our identity, checks ours (a full
   quick_check up to a size, the header's page count always) and creates or
   upgrades the tables. On SF_OK *db is open; otherwise it is NULL and *why
   explains. *id receives the identity (device, inode) of the file examined. */
int store_file_open(const char *path, sqlite3 **db, struct stat *id, char **why);

/* Moves the damaged file at path (only if it is still the file *id) to
   PATH.damaged-N with the first N not yet taken, its -wal and -journal files
   beside it under the same name; removes its -shm index. Returns the new name
   (caller frees), or NULL when it could not be moved (*why explains). */
char *store_file_move_aside(const char *path, const struct stat *id, char **why);

/* Maps an SQLite result code to 1 when it means a damaged file. */
int store_file_is_damage(int rc);

/* Closes db without folding its write-ahead log into the (damaged) file. */
void store_file_close_damaged(sqlite3 *db);

#endif
