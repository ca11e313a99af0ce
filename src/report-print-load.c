/* report-print-load.c - finding and loading the print module
 * (report-print.h): the file REPORT_PRINT_ENV names, else the one beside
 * the running program (the build tree's src/), else the one installed in
 * $(pkglibdir).  RTLD_NOW, so that a symbol the program lacks is an error
 * here and not a crash half-way through a page. */
#include <config.h>

#include <dlfcn.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "report-print.h"
#include "util-buf.h"
#include "util-err.h"

#ifndef BEAMLEDGER_PKGLIBDIR
#error "BEAMLEDGER_PKGLIBDIR: the folder the module is installed in (Makefile.am)"
#endif

/* The folder of the running program, with a slash; NULL where /proc does
 * not say. */
static char *
exe_dir(void)
{
	size_t n = 256;

	for (;;) {
		char *p = xmalloc(n), *slash;
		ssize_t got = readlink("/proc/self/exe", p, n);

		if (got < 0) {
			free(p);
			return NULL;
		}
		if ((size_t)got < n) {
			p[got] = '\0';
			if ((slash = strrchr(p, '/')) == NULL) {
				free(p);
				return NULL;
			}
			slash[1] = '\0';
			return p;
		}
		free(p);
		n *= 2;
	}
}

/* "version 0.1.0, interface 1, sizes 312 96 ..." for the messages. */
static char *
stamp_text(const struct report_print_stamp *s)
{
	struct buf b;

	buf_init(&b);
	buf_printf(&b, "version %.*s, interface %u, sizes", (int)sizeof s->version,
	    s->version, (unsigned)s->abi);
	for (int i = 0; i < REPORT_PRINT_NSIZES; i++)
		buf_printf(&b, " %u", (unsigned)s->sizes[i]);
	return buf_take(&b);
}

/* Opens and checks the module at path; NULL with *cause. */
static const struct report_print *
open_checked(const char *path, char **cause)
{
	struct report_print_stamp want;
	const struct report_print *m;
	char *got_s, *want_s;
	void *h;

	if ((h = dlopen(path, RTLD_NOW | RTLD_LOCAL)) == NULL)
		return fail_with(cause, "the print module %s cannot be loaded: %s; nothing "
		    "written; the Markdown form (--format md) needs no module", path,
		    dlerror()), NULL;
	/* a module refused here stays loaded: unloading pango is not safe */
	if ((m = dlsym(h, REPORT_PRINT_SYMBOL)) == NULL || m->stamp.magic != REPORT_PRINT_MAGIC)
		return fail_with(cause, "%s is not a beamledger print module (no '%s' in it); "
		    "nothing written; the Markdown form (--format md) needs no module", path,
		    REPORT_PRINT_SYMBOL), NULL;
	report_print_stamp_fill(&want);
	if (memcmp(&want, &m->stamp, sizeof want) == 0 && m->pdf != NULL && m->svg != NULL)
		return m;
	got_s = stamp_text(&m->stamp);
	want_s = stamp_text(&want);
	fail_with(cause, "the print module %s is from another build of beamledger (%s; this "
	    "program is %s): install both from one build; nothing written; the Markdown "
	    "form (--format md) needs no module", path, got_s, want_s);
	free(got_s);
	free(want_s);
	return NULL;
}

const struct report_print *
report_print_load(char **cause)
{
	/* process-long: the module is never unloaded (report-print.h) */
	static const struct report_print *loaded;
	const char *env = getenv(REPORT_PRINT_ENV);
	char *paths[2] = { NULL, NULL }, *dir;
	const struct report_print *m = NULL;
	struct buf tried;
	size_t n = 0;

	if (loaded != NULL)
		return loaded;
	if (env != NULL && env[0] != '\0') {
		/* dlopen searches the library path for a name without a slash */
		paths[n++] = strchr(env, '/') != NULL ? xstrdup(env) : xasprintf("./%s", env);
	} else {
		if ((dir = exe_dir()) != NULL)
			paths[n++] = xasprintf("%s%s", dir, REPORT_PRINT_FILE);
		free(dir);
		paths[n++] = xstrdup(BEAMLEDGER_PKGLIBDIR "/" REPORT_PRINT_FILE);
	}
	buf_init(&tried);
	for (size_t i = 0; i < n; i++) {
		if (access(paths[i], F_OK) == 0) {
			/* the first one there decides: a broken module is not
			 * quietly passed over for another */
			m = open_checked(paths[i], cause);
			goto out;
		}
		buf_printf(&tried, "%s%s", i == 0 ? "" : ", then ", paths[i]);
	}
	fail_with(cause, "PDF and SVG are drawn by the print module, which was not found "
	    "(looked for %s%s); nothing written; the Markdown form (--format md) needs no module",
	    tried.s, env != NULL && env[0] != '\0' ? ", as " REPORT_PRINT_ENV " says" : "");
out:
	buf_release(&tried);
	for (size_t i = 0; i < n; i++)
		free(paths[i]);
	loaded = m;
	return m;
}
