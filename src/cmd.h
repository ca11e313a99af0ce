/* cmd.h - the command table behind main(): one function per command, each
 * in a cmd-*.c file.  A command returns the process exit status: 0 fine,
 * 1 something over threshold (trace, diff), 2 trouble. */
#ifndef CMD_H
#define CMD_H

#define PROG "beamledger"

struct cmd_ctx {
	const char *db_path;        /* --db or BEAMLEDGER_DB; NULL: default */
	const char *author;         /* --author or $USER */
};

struct cmd {
	const char *name;
	int       (*fn)(struct cmd_ctx *, int argc, char **argv);
	const char *args;
	const char *summary;
};

extern const struct cmd cmd_table[];

/* "beamledger: <msg>" and "Try 'beamledger --help'"; returns 2. */
int  cmd_usage(const char *fmt, ...) __attribute__((format(printf, 1, 2)));
/* "beamledger: <cause>", frees cause; returns 2. */
int  cmd_fail(char *cause);
/* Colour for stdout: --color=always|never|auto, NO_COLOR, a terminal. */
int  cmd_color(const char *when);
/* Writes text to stdout; returns 0, or 2 after a message when it fails. */
int  cmd_print(const char *text);

/* FILE ("-": stdin) or BENCH[@REV] in the database; *origin gets "draft",
 * "r3", ... (NULL for a file).  NULL with *cause NULL: already said why. */
struct bench;
struct bench *cmd_bench_open(struct cmd_ctx *, const char *arg, char **origin,
                  char **cause);                          /* caller frees */

int  cmd_trace(struct cmd_ctx *, int, char **);
/* Operating points and sweeps (cmd-point.c, cmd-sweep.c). */
int  cmd_point(struct cmd_ctx *, int, char **);
int  cmd_sweep(struct cmd_ctx *, int, char **);
int  cmd_demo(struct cmd_ctx *, int, char **);

/* The bench database (cmd-store*.c). */
int  cmd_import(struct cmd_ctx *, int, char **);
int  cmd_list(struct cmd_ctx *, int, char **);
int  cmd_show(struct cmd_ctx *, int, char **);
int  cmd_add(struct cmd_ctx *, int, char **);
int  cmd_set(struct cmd_ctx *, int, char **);
int  cmd_remove(struct cmd_ctx *, int, char **);
int  cmd_move(struct cmd_ctx *, int, char **);
int  cmd_commit(struct cmd_ctx *, int, char **);
int  cmd_log(struct cmd_ctx *, int, char **);
int  cmd_diff(struct cmd_ctx *, int, char **);
int  cmd_restore(struct cmd_ctx *, int, char **);
int  cmd_label(struct cmd_ctx *, int, char **);
int  cmd_clone(struct cmd_ctx *, int, char **);
int  cmd_export(struct cmd_ctx *, int, char **);
int  cmd_delete(struct cmd_ctx *, int, char **);
int  cmd_parts(struct cmd_ctx *, int, char **);
int  cmd_check(struct cmd_ctx *, int, char **);

/* The terminal workbench (cmd-ui.c): `open [BENCH]`, and no command at all. */
int  cmd_open(struct cmd_ctx *, int, char **);
int  cmd_workbench(struct cmd_ctx *);

#endif
