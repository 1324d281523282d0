/*
 * pg_stubs.c - just enough of the server's error reporting and array
 * helpers to run glue code (the files under src/, compiled unchanged against the
 * PostgreSQL 15 headers) in a fuzzer, without a server.
 *
 * ereport(ERROR, ...) ends in errfinish(), which here records the SQLSTATE
 * and messages in stub_error and long-jumps to stub_catch, which the
 * fuzzer sets with sigsetjmp before each call.  Only the functions the
 * glue under test references are provided; the linker names any new one.
 */
#include "postgres.h"

#include <setjmp.h>
#include <stdarg.h>
#include <stdio.h>

#include "utils/array.h"
#include "utils/memutils.h"

#include "pg_stubs.h"

/* port.h maps these to the server's own versions, which we do not link. */
#undef vsnprintf
#undef snprintf
#undef fprintf

stub_error_data stub_error;
sigjmp_buf *stub_catch;

/* Starts a report: every level is reported, and only ERROR is expected. */
bool
errstart(int elevel, const char *domain)
{
	memset(&stub_error, 0, sizeof(stub_error));
	stub_error.elevel = elevel;
	stub_error.sqlerrcode = ERRCODE_INTERNAL_ERROR;
	return true;
}

/* Starts a report of level ERROR or above (the compiler's cold path). */
bool
errstart_cold(int elevel, const char *domain)
{
	return errstart(elevel, domain);
}

/* Records the SQLSTATE. */
int
errcode(int sqlerrcode)
{
	stub_error.sqlerrcode = sqlerrcode;
	return 0;
}

/* Records a formatted message into a fixed buffer. */
static void
record(char *buf, size_t size, const char *fmt, va_list ap)
{
	vsnprintf(buf, size, fmt, ap);
}

/* Records the primary message. */
int
errmsg(const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	record(stub_error.message, sizeof(stub_error.message), fmt, ap);
	va_end(ap);
	return 0;
}

/* Records an internal (elog) message. */
int
errmsg_internal(const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	record(stub_error.message, sizeof(stub_error.message), fmt, ap);
	va_end(ap);
	stub_error.internal = true;
	return 0;
}

/* Records the detail. */
int
errdetail(const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	record(stub_error.detail, sizeof(stub_error.detail), fmt, ap);
	va_end(ap);
	return 0;
}

/* Records the hint. */
int
errhint(const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	record(stub_error.hint, sizeof(stub_error.hint), fmt, ap);
	va_end(ap);
	return 0;
}

/* Ends a report: ERROR long-jumps to the fuzzer, lesser levels return. */
void
errfinish(const char *filename, int lineno, const char *funcname)
{
	if (stub_error.elevel < ERROR)
		return;
	if (stub_catch == NULL)
	{
		fprintf(stderr, "ERROR outside a guarded call: %s\n", stub_error.message);
		abort();
	}
	siglongjmp(*stub_catch, 1);
}

/*
 * Number of elements of an array of the given dimensions.  Behaves as
 * PostgreSQL 15's ArrayGetNItems in arrayutils.c (written from memory of
 * its behaviour: 0 for no dimensions, an ERROR for negative or
 * overflowing sizes).
 */
int
ArrayGetNItems(int ndim, const int *dims)
{
	int64		ret = 1;

	if (ndim <= 0)
		return 0;
	for (int i = 0; i < ndim; i++)
	{
		if (dims[i] < 0 || ret * dims[i] > (int64) MaxArraySize)
			ereport(ERROR,
					(errcode(ERRCODE_PROGRAM_LIMIT_EXCEEDED),
					 errmsg("array size exceeds the maximum allowed (%d)",
							(int) MaxArraySize)));
		ret *= dims[i];
	}
	return (int) ret;
}

/*
 * palloc and pfree as malloc and free, remembering what is outstanding so
 * that stub_palloc_reset can free it all, as the server frees a memory
 * context after an ERROR (the EWKB decoder allocates before it validates).
 */
#define STUB_MAX_ALLOCS 64
static void *stub_allocs[STUB_MAX_ALLOCS];
static int	stub_nallocs;

void *
palloc(Size size)
{
	void	   *p = malloc(size > 0 ? size : 1);

	if (p == NULL || stub_nallocs == STUB_MAX_ALLOCS)
		abort();
	stub_allocs[stub_nallocs++] = p;
	return p;
}

void
pfree(void *pointer)
{
	for (int i = 0; i < stub_nallocs; i++)
		if (stub_allocs[i] == pointer)
		{
			stub_allocs[i] = stub_allocs[--stub_nallocs];
			break;
		}
	free(pointer);
}

void
stub_palloc_reset(void)
{
	while (stub_nallocs > 0)
		free(stub_allocs[--stub_nallocs]);
}

/* repalloc as realloc, keeping the block in the outstanding list. */
void *
repalloc(void *pointer, Size size)
{
	void	   *p = realloc(pointer, size > 0 ? size : 1);

	if (p == NULL)
		abort();
	for (int i = 0; i < stub_nallocs; i++)
		if (stub_allocs[i] == pointer)
		{
			stub_allocs[i] = p;
			return p;
		}
	abort();					/* not a block of ours */
}

/* The server's snprintf family (port.h maps the names), as the C library's. */
int
pg_vsnprintf(char *str, size_t count, const char *fmt, va_list args)
{
	return vsnprintf(str, count, fmt, args);
}

int
pg_snprintf(char *str, size_t count, const char *fmt,...)
{
	va_list		ap;
	int			r;

	va_start(ap, fmt);
	r = vsnprintf(str, count, fmt, ap);
	va_end(ap);
	return r;
}
