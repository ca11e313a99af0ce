/* bench-file.h - the bench file (format "beamledger-bench-1", JSON) read
 * into a struct bench and written back.  The contract is
 * ../shared/spec/bench-format.md and beamledger-bench(5).
 *
 * Reading is strict: unknown keys, wrong types, values out of range, units
 * of the wrong dimension are errors whose message names the element id and
 * the key.  Callers prefix the file name.  Writing uses plain SI numbers
 * printed so that they read back to the same double. */
#ifndef BENCH_FILE_H
#define BENCH_FILE_H

#include <stddef.h>

#include <jansson.h>

#include "core-model.h"

/* The largest bench file read, in bytes (64 MiB: about ten times a bench
 * of 10^5 elements).  Larger input, /dev/zero included, is refused as soon
 * as this much has been read. */
#define BENCH_FILE_MAX  (64 << 20)

/* Parses text (a leading UTF-8 byte-order mark is skipped); `where` (file name or "-") prefixes every message.
 * Returns a validated bench, or NULL with *cause set. */
struct bench *bench_file_parse(const char *text, size_t len, const char *where,
                  char **cause);                          /* caller frees */
/* The two ways bench_file_parse reads (tests compare them).  The tree
 * reader takes the whole file as one jansson tree and writes every error
 * message; the fast one (bench-file-scan.c) reads a valid file element by
 * element in a fraction of the time and memory, and returns NULL, saying
 * nothing, on anything else.  Text for the fast one has no byte-order mark. */
struct bench *bench_file_parse_tree(const char *text, size_t len, const char *where,
                  char **cause);                          /* caller frees */
struct bench *bench_file_parse_fast(const char *text, size_t len);   /* caller frees */
/* Reads a file ("-": standard input). */
struct bench *bench_file_read(const char *path, char **cause);   /* caller frees */
/* Writes the bench as indented JSON text with a final newline. */
char         *bench_file_dump(const struct bench *);     /* caller frees */

/* One element, for the parts shelf and the store.  With need_id == 0 the
 * object may lack "id" (a part), and el->id is left empty.  Side branches
 * are read too when allow_branch != 0.  Returns 0, or nonzero (-1, or -2
 * when a nested element's message already says where) with *cause set. */
int           bench_element_from_json(json_t *obj, struct element *el,
                  int need_id, int allow_branch, size_t depth, char **cause);
json_t       *bench_element_to_json(const struct element *, int with_branch); /* caller decrefs */
/* The source and top-level settings without the path. */
json_t       *bench_head_to_json(const struct bench *);  /* caller decrefs */
int           bench_head_from_json(json_t *obj, struct bench *, char **cause);
/* Reads a whole file into memory (NUL-terminated), at most BENCH_FILE_MAX
 * bytes, without a leading byte-order mark. */
char         *bench_slurp(const char *path, size_t *len, char **cause);   /* caller frees */

#endif
