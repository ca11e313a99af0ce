/* cmd.h - the command table behind main(): one function per command, each
 * in a cmd-*.c file.  A command returns the process exit status: 0 fine,
 * 1 something over threshold (trace), 2 trouble. */
#ifndef CMD_H
#define CMD_H

#define PROG "beamledger"

struct cmd_ctx {
	const char *db_path;        /* --db or BEAMLEDGER_DB; NULL: default */
	const char *author;         /* --author, $USER, the login name or "unknown" */
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

/* `help [COMMAND]`: the overview of --help, or one command's own --help. */
int  cmd_help(struct cmd_ctx *, int, char **);
/* FILE ("-": stdin) or BENCH[@SETUP] in the database; *origin gets "draft",
 * "#3", ... (NULL for a file).  NULL with *cause NULL: already said why. */
struct bench;
struct bench *cmd_bench_open(struct cmd_ctx *, const char *arg, char **origin,
                  char **cause);
/* The same (or the built-in demo), at operating point `point` when it is
 * not NULL; the bench comes back without its points list.  NULL with
 * *cause NULL: already said why. */
struct bench *cmd_bench_at_point(struct cmd_ctx *, int demo, const char *arg,
                  const char *point, char **cause);               /* caller frees */                          /* caller frees */

int  cmd_trace(struct cmd_ctx *, int, char **);
/* Operating points and sweeps (cmd-point.c, cmd-sweep.c). */
int  cmd_point(struct cmd_ctx *, int, char **);
int  cmd_sweep(struct cmd_ctx *, int, char **);
/* The tolerance Monte-Carlo (cmd-tolerance.c). */
int  cmd_tolerance(struct cmd_ctx *, int, char **);
int  cmd_demo(struct cmd_ctx *, int, char **);
/* The printed review (cmd-report.c). */
int  cmd_report(struct cmd_ctx *, int, char **);

/* The bench database (cmd-store*.c). */
int  cmd_import(struct cmd_ctx *, int, char **);
int  cmd_list(struct cmd_ctx *, int, char **);
int  cmd_chain(struct cmd_ctx *, int, char **);
int  cmd_place(struct cmd_ctx *, int, char **);
int  cmd_set(struct cmd_ctx *, int, char **);
int  cmd_lift(struct cmd_ctx *, int, char **);
int  cmd_shift(struct cmd_ctx *, int, char **);
int  cmd_record(struct cmd_ctx *, int, char **);
int  cmd_history(struct cmd_ctx *, int, char **);
int  cmd_compare(struct cmd_ctx *, int, char **);
int  cmd_reinstate(struct cmd_ctx *, int, char **);
int  cmd_mark(struct cmd_ctx *, int, char **);
int  cmd_copy(struct cmd_ctx *, int, char **);
int  cmd_export(struct cmd_ctx *, int, char **);
int  cmd_delete(struct cmd_ctx *, int, char **);
int  cmd_parts(struct cmd_ctx *, int, char **);
int  cmd_check(struct cmd_ctx *, int, char **);

/* The terminal workbench (cmd-ui.c): `open [BENCH]`, and no command at all. */
int  cmd_open(struct cmd_ctx *, int, char **);
int  cmd_workbench(struct cmd_ctx *);

#endif
