/*
 * pg_stubs.h - the error record the server stubs fill in (pg_stubs.c).
 */
#ifndef FRECHET_PG_STUBS_H
#define FRECHET_PG_STUBS_H

#include <setjmp.h>
#include <stdbool.h>

/* The last ereport/elog seen by the stubs. */
typedef struct stub_error_data
{
	int			elevel;
	int			sqlerrcode;
	bool		internal;		/* raised by elog (errmsg_internal) */
	char		message[512];
	char		detail[512];
	char		hint[512];
} stub_error_data;

extern stub_error_data stub_error;

/* Where an ERROR long-jumps to; set around each guarded call. */
extern sigjmp_buf *stub_catch;

/* Frees every palloc'd block still outstanding (a memory context reset). */
extern void stub_palloc_reset(void);

#endif							/* FRECHET_PG_STUBS_H */
