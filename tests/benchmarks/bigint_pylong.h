/*
 * The few GMP mpz_* calls of amalgebra/coupling/_racah6j.c, on CPython's own integers (PyLong).
 *
 * For a measurement only (tests/benchmarks/bench_kernel_builds.py): would a GMP-free build of the same
 * C kernel, needing nothing but a C compiler and Python's headers (so: easy on Windows), be as fast as
 * the GMP build?  The benchmark compiles a copy of the kernel's source with `#include <gmp.h>` replaced
 * by this file.  Only the calls the kernel uses exist here, with GMP's names and argument order
 * (destination first).  Not part of the package.
 *
 * An mpz_t holds one reference to an immutable Python int; every operation makes the new value
 * and then drops the old one, so a destination may also be an operand.  Like GMP, which aborts
 * when memory runs out, an allocation failure here ends the process (Py_FatalError): the kernel's
 * functions return no error codes.  The interpreter lock is held throughout (as for the GMP build).
 */
#ifndef AMALGEBRA_BIGINT_PYLONG_H
#define AMALGEBRA_BIGINT_PYLONG_H

#include <Python.h>
#include <stdarg.h>
#include <string.h>

typedef struct { PyObject *v; } amz_struct;
typedef amz_struct mpz_t[1];
typedef amz_struct *mpz_ptr;
typedef const amz_struct *mpz_srcptr;

#define AMZ_CHECK(obj) ((obj) != NULL ? (obj) : amz_fail())

static PyObject *amz_fail(void)
{
    Py_FatalError("amalgebra._racah6j: out of memory in big-integer arithmetic");
    return NULL;
}

/* replace the value of dst by the new reference `value` */
static inline void amz_take(mpz_ptr dst, PyObject *value)
{
    PyObject *old = dst->v;
    dst->v = AMZ_CHECK(value);
    Py_XDECREF(old);
}

static inline void mpz_init(mpz_ptr x) { x->v = AMZ_CHECK(PyLong_FromLong(0)); }
static inline void mpz_clear(mpz_ptr x) { Py_CLEAR(x->v); }

static void mpz_inits(mpz_ptr x, ...)
{
    va_list ap;
    va_start(ap, x);
    while (x != NULL) {
        mpz_init(x);
        x = va_arg(ap, mpz_ptr);
    }
    va_end(ap);
}

static void mpz_clears(mpz_ptr x, ...)
{
    va_list ap;
    va_start(ap, x);
    while (x != NULL) {
        mpz_clear(x);
        x = va_arg(ap, mpz_ptr);
    }
    va_end(ap);
}

static inline void mpz_set(mpz_ptr dst, mpz_srcptr src)
{
    Py_INCREF(src->v);
    amz_take(dst, src->v);
}

static inline void mpz_set_ui(mpz_ptr dst, unsigned long value)
{
    amz_take(dst, PyLong_FromUnsignedLong(value));
}

static inline void mpz_mul(mpz_ptr dst, mpz_srcptr a, mpz_srcptr b)
{
    amz_take(dst, PyNumber_Multiply(a->v, b->v));
}

static inline void mpz_mul_ui(mpz_ptr dst, mpz_srcptr a, unsigned long b)
{
    PyObject *factor = AMZ_CHECK(PyLong_FromUnsignedLong(b));
    PyObject *product = PyNumber_Multiply(a->v, factor);
    Py_DECREF(factor);
    amz_take(dst, product);
}

static inline void mpz_add(mpz_ptr dst, mpz_srcptr a, mpz_srcptr b)
{
    amz_take(dst, PyNumber_Add(a->v, b->v));
}

static inline void mpz_sub(mpz_ptr dst, mpz_srcptr a, mpz_srcptr b)
{
    amz_take(dst, PyNumber_Subtract(a->v, b->v));
}

static inline void mpz_neg(mpz_ptr dst, mpz_srcptr a)
{
    amz_take(dst, PyNumber_Negative(a->v));
}

/* exact division (b divides a), so floor division is exact division */
static inline void mpz_divexact(mpz_ptr dst, mpz_srcptr a, mpz_srcptr b)
{
    amz_take(dst, PyNumber_FloorDivide(a->v, b->v));
}

/* math.gcd (CPython's C API has no public gcd); looked up once */
static void mpz_gcd(mpz_ptr dst, mpz_srcptr a, mpz_srcptr b)
{
    static PyObject *gcd = NULL;
    if (gcd == NULL) {
        PyObject *math = AMZ_CHECK(PyImport_ImportModule("math"));
        gcd = AMZ_CHECK(PyObject_GetAttrString(math, "gcd"));
        Py_DECREF(math);
    }
    amz_take(dst, PyObject_CallFunctionObjArgs(gcd, a->v, b->v, NULL));
}

/* sign of x (-1, 0, 1); `overflow` already gives it for values beyond a C long */
static inline int mpz_sgn(mpz_srcptr x)
{
    int overflow;
    long small = PyLong_AsLongAndOverflow(x->v, &overflow);
    if (overflow)
        return overflow;
    return (small > 0) - (small < 0);
}

static inline int mpz_cmp_ui(mpz_srcptr x, unsigned long value)
{
    int overflow;
    long small = PyLong_AsLongAndOverflow(x->v, &overflow);
    if (overflow)
        return overflow;
    if (small < 0)
        return -1;
    return ((unsigned long)small > value) - ((unsigned long)small < value);
}

static inline int mpz_fits_slong_p(mpz_srcptr x)
{
    int overflow;
    (void)PyLong_AsLongAndOverflow(x->v, &overflow);
    return overflow == 0;
}

static inline long mpz_get_si(mpz_srcptr x)
{
    int overflow;
    return PyLong_AsLongAndOverflow(x->v, &overflow);
}

/* hexadecimal text of x as GMP writes it ("-" and digits, no "0x"); the kernel turns it back into a
 * Python int, which is a copy here (only for values beyond a C long, three per symbol at most) */
static size_t mpz_sizeinbase(mpz_srcptr x, int base)
{
    PyObject *text = AMZ_CHECK(PyNumber_ToBase(x->v, base));
    size_t length = (size_t)PyUnicode_GET_LENGTH(text);
    Py_DECREF(text);
    return length;  /* >= the digits: the "0x" prefix is counted too */
}

static char *mpz_get_str(char *buf, int base, mpz_srcptr x)
{
    PyObject *text = AMZ_CHECK(PyNumber_ToBase(x->v, base));
    const char *chars = PyUnicode_AsUTF8(text);
    char *out = buf;
    if (chars == NULL)
        amz_fail();
    if (*chars == '-')
        *out++ = *chars++;
    chars += 2;  /* "0x" */
    strcpy(out, chars);
    Py_DECREF(text);
    return buf;
}

#endif
