/* cmd-store.h - what the database commands (cmd-store*.c) share: opening
 * the database the way every command does, reading BENCH[@REV], and
 * writing a file atomically.  Private to those files. */
#ifndef CMD_STORE_H
#define CMD_STORE_H

#include "cmd.h"
#include "store.h"

/* Opens ctx->db_path (or the default); says so on stderr when the file is
 * read-only.  NULL after printing the error. */
struct store *cmd_store_open(const struct cmd_ctx *);
/* The same for commands that only act on benches already there: a missing
 * file is an error, not a new database (a mistyped --db makes nothing). */
struct store *cmd_store_open_existing(const struct cmd_ctx *);
/* Prints cause, closes the store; returns 2. */
int           cmd_store_fail(struct store *, char *cause);

/* A bench reference "BENCH", "BENCH@SETUP": the whole text when it names a
 * bench, else split at the last '@'.  *rev is NULL for the draft. */
void          cmd_bench_ref(struct store *, const char *arg, char **name, char **rev);
/* Loads a reference; *shown gets "#3", "aligned (#3)" or "draft". */
struct bench *cmd_bench_load(struct store *, const char *arg, char **name, char **shown,
                  char **cause);
/* "#3", "aligned (#3)", "draft" for a SETUP text and its number. */
char         *cmd_rev_shown(const char *rev, int no);
/* Refuses the retired spelling "r3" of a setup with a message that says
 * how to write it; 0 for anything else (NULL too). */
int           cmd_rev_check(const char *rev, char **cause);
/* "draft = #3", "draft: changed since #3, not recorded", "draft: not
 * recorded yet" for a bench (caller frees; NULL with *cause). */
char         *cmd_draft_words(struct store *, const char *name, char **cause);

/* Writes text to path through a temporary file and rename(2), so that a
 * reader never sees half a file. */
int           cmd_write_atomic(const char *path, const char *text, char **cause);

/* getopt_long over argv from index 1, permuting so options may follow the
 * operands; resets getopt's state first. */
void          cmd_getopt_reset(void);
/* Unknown options and missing arguments after getopt_long, in the house
 * words (usage, exit 2). */
int           cmd_bad_option(const char *cmd, int argc, char **argv);
/* --format table|json for a listing command: *json 0 or 1; usage error else. */
int           cmd_format_opt(const char *cmd, const char *arg, int *json);
/* An element's given values, "focal 250 mm, damage.fluence 10 J/cm²", into b. */
struct buf;
void          cmd_values_line(struct buf *b, const struct element *el);

#endif
